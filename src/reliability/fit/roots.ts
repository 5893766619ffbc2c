/**
 * One-dimensional solvers the fits share: a bracket found by expansion, Brent's root finder inside
 * it, and golden-section search for a maximum. None needs a starting guess to be good, only a
 * place to start looking, which is what makes the fits robust on awkward data.
 */

const EPS = 2.220446049250313e-16;

/**
 * Widens [a, b] until f changes sign, stepping by 1.6 times the width on the side where |f| is
 * smaller (the classic expansion of W. H. Press et al., Numerical Recipes, §9.1; from memory),
 * never leaving [min, max]. Returns undefined when no sign change is found inside the limits.
 */
export function expandBracket(
  f: (x: number) => number,
  a: number,
  b: number,
  min: number,
  max: number,
  maxSteps = 200,
): [number, number] | undefined {
  let fa = f(a);
  let fb = f(b);
  for (let step = 0; step < maxSteps; step++) {
    // A function that cannot be evaluated somewhere gives no bracket rather than a false one.
    if (Number.isNaN(fa) || Number.isNaN(fb)) return undefined;
    if (Math.sign(fa) !== Math.sign(fb) || fa === 0 || fb === 0) return [a, b];
    const atMin = a <= min;
    const atMax = b >= max;
    if (atMin && atMax) return undefined;
    const grow = 1.6 * (b - a);
    if ((Math.abs(fa) < Math.abs(fb) && !atMin) || atMax) {
      a = Math.max(min, a - grow);
      fa = f(a);
    } else {
      b = Math.min(max, b + grow);
      fb = f(b);
    }
  }
  return undefined;
}

/**
 * Brent's method (inverse quadratic interpolation guarded by bisection): R. P. Brent, Algorithms
 * for Minimization without Derivatives, 1973, ch. 4, in the arrangement of Numerical Recipes
 * `zbrent` (from memory). f(a) and f(b) must differ in sign. `tol` is an absolute tolerance on x.
 * Returns NaN if f gives NaN inside the bracket.
 */
export function brentRoot(f: (x: number) => number, a: number, b: number, tol: number, maxIter = 300): number {
  let fa = f(a);
  let fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (Math.sign(fa) === Math.sign(fb)) throw new RangeError('brentRoot: f(a) and f(b) have the same sign');
  let c = b;
  let fc = fb;
  let d = b - a;
  let e = d;
  for (let iter = 0; iter < maxIter; iter++) {
    if (Math.sign(fb) === Math.sign(fc)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol1 = 2 * EPS * Math.abs(b) + 0.5 * tol;
    const xm = 0.5 * (c - b);
    if (Math.abs(xm) <= tol1 || fb === 0) return b;
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * xm * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * xm * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * xm * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = xm;
        e = d;
      }
    } else {
      d = xm;
      e = d;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol1 ? d : xm > 0 ? tol1 : -tol1;
    fb = f(b);
    if (Number.isNaN(fb)) return NaN;
  }
  return b;
}

/**
 * Root of f by expansion from [a, b] then Brent; undefined when no sign change lies in [min, max]
 * or f cannot be evaluated (NaN) on the way.
 */
export function findRoot(
  f: (x: number) => number,
  a: number,
  b: number,
  min: number,
  max: number,
  tol: number,
): number | undefined {
  const bracket = expandBracket(f, a, b, min, max);
  if (!bracket) return undefined;
  const x = brentRoot(f, bracket[0], bracket[1], tol);
  return Number.isNaN(x) ? undefined : x;
}

const INV_PHI = (Math.sqrt(5) - 1) / 2;

/**
 * Golden-section search for the maximum of f on [a, b] (J. Kiefer, 1953; common practice). Finds a
 * local maximum; callers start it from the best point of a grid so it is the global one of the grid.
 */
export function goldenMax(f: (x: number) => number, a: number, b: number, tol: number): { x: number; value: number } {
  let x1 = b - INV_PHI * (b - a);
  let x2 = a + INV_PHI * (b - a);
  let f1 = f(x1);
  let f2 = f(x2);
  // The cap only guards against a tolerance finer than the floating-point spacing near x.
  for (let iter = 0; iter < 400 && b - a > tol; iter++) {
    if (f1 < f2) {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + INV_PHI * (b - a);
      f2 = f(x2);
    } else {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - INV_PHI * (b - a);
      f1 = f(x1);
    }
  }
  return f1 >= f2 ? { x: x1, value: f1 } : { x: x2, value: f2 };
}
