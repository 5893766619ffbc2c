/**
 * Numerical integration for the averaged forms of the failure models: adaptive Gauss–Legendre.
 * Each panel is integrated with a 10-point Gauss–Legendre rule and again as two halves; a panel is
 * accepted when the two agree to the tolerance, otherwise both halves are refined (the bisection
 * scheme is common practice, no source).
 */

interface Rule {
  nodes: number[];
  weights: number[];
}

/**
 * Nodes and weights of the n-point Gauss–Legendre rule on [−1, 1], by Newton's method on the
 * Legendre polynomial P_n with the three-term recurrence (Numerical Recipes §4.6, `gauleg`).
 * Computed rather than typed in, so no mistyped digit can be wrong.
 */
function gaussLegendre(n: number): Rule {
  const nodes = new Array<number>(n);
  const weights = new Array<number>(n);
  const m = Math.floor((n + 1) / 2);
  for (let i = 0; i < m; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 0;
    for (let iter = 0; iter < 100; iter++) {
      let p1 = 1;
      let p2 = 0;
      for (let j = 1; j <= n; j++) {
        const p3 = p2;
        p2 = p1;
        p1 = ((2 * j - 1) * z * p2 - (j - 1) * p3) / j;
      }
      dp = (n * (z * p1 - p2)) / (z * z - 1);
      const dz = p1 / dp;
      z -= dz;
      if (Math.abs(dz) < 1e-16) break;
    }
    nodes[i] = -z;
    nodes[n - 1 - i] = z;
    const w = 2 / ((1 - z * z) * dp * dp);
    weights[i] = w;
    weights[n - 1 - i] = w;
  }
  return { nodes, weights };
}

const RULE = gaussLegendre(10);

function panel(f: (x: number) => number, a: number, b: number): number {
  const half = 0.5 * (b - a);
  const mid = 0.5 * (a + b);
  let sum = 0;
  for (let i = 0; i < RULE.nodes.length; i++) sum += RULE.weights[i]! * f(mid + half * RULE.nodes[i]!);
  return sum * half;
}

/**
 * ∫ₐᵇ f(x) dx to a relative tolerance (default 1e-13). The integrand must be finite on [a, b];
 * endpoint kinks and weak singularities of the derivative are handled by the refinement.
 */
export function integrate(f: (x: number) => number, a: number, b: number, relTol = 1e-13): number {
  if (a === b) return 0;
  const whole = panel(f, a, b);
  return refine(f, a, b, whole, relTol, Math.abs(whole), 0);
}

function refine(
  f: (x: number) => number,
  a: number,
  b: number,
  whole: number,
  relTol: number,
  scale: number,
  depth: number,
): number {
  const m = 0.5 * (a + b);
  const left = panel(f, a, m);
  const right = panel(f, m, b);
  const both = left + right;
  const newScale = Math.max(scale, Math.abs(both));
  if (Math.abs(both - whole) <= relTol * newScale || depth >= 40 || m === a || m === b) return both;
  return (
    refine(f, a, m, left, relTol, newScale, depth + 1) + refine(f, m, b, right, relTol, newScale, depth + 1)
  );
}
