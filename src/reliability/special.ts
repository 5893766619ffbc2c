/**
 * Special functions the failure models, the distributions and the life-data fits rest on.
 *
 * Pure functions of plain numbers; no dependencies. Each says which published method it uses, so a
 * reviewer can check it, and the tests hold every one to @stdlib/stats-base-dists-* over a grid.
 * Arguments outside a function's domain give NaN (never a throw): callers validate study input
 * before it reaches here, and NaN propagates visibly rather than hiding as a plausible number.
 */

const SQRT_2PI = 2.5066282746310002; // √(2π)
const LN_SQRT_2PI = 0.9189385332046728; // ½·ln(2π)
const EPS = 2.220446049250313e-16;
/** Below this a continued-fraction denominator is treated as zero (modified Lentz method). */
const TINY = 1e-300;

// ---------------------------------------------------------------------------------------------
// Gamma function

/**
 * Lanczos approximation, g = 7, n = 9 (C. Lanczos, SIAM J. Numer. Anal. B 1, 1964), with the
 * widely published coefficient set for these g and n (from memory; the tests hold lnΓ and Γ to
 * @stdlib and to exact factorials). Γ(z+1) = √(2π)·t^(z+½)·e^(−t)·A(z), t = z + g + ½; about 15
 * significant digits for z ≥ −½.
 */
const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
  -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
  1.5056327351493116e-7,
];

function lanczosSum(z: number): number {
  let a = LANCZOS[0]!;
  for (let i = 1; i < LANCZOS.length; i++) a += LANCZOS[i]! / (z + i);
  return a;
}

/** sin(πx) without the error of forming πx for large |x|; exact zeros at the integers. */
function sinPi(x: number): number {
  // Reduce to r ∈ [−1, 1] with x = r + 2n (exact in binary floating point).
  let r = x - 2 * Math.round(x / 2);
  let sign = 1;
  if (r < 0) {
    r = -r;
    sign = -1;
  }
  if (r === 0 || r === 1) return 0;
  if (r > 0.5) r = 1 - r; // sin(π(1−r)) = sin(πr)
  return sign * Math.sin(Math.PI * r);
}

/** ln|Γ(x)|. +∞ at the poles (0, −1, −2, …). Lanczos for x ≥ ½, reflection Γ(x)Γ(1−x) = π/sin(πx) below. */
export function lnGamma(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x === Infinity) return Infinity;
  if (x < 0.5) {
    if (x === -Infinity) return NaN;
    const s = sinPi(x);
    if (s === 0) return Infinity;
    return Math.log(Math.PI / Math.abs(s)) - lnGamma(1 - x);
  }
  const z = x - 1;
  const t = z + LANCZOS_G + 0.5;
  return LN_SQRT_2PI + (z + 0.5) * Math.log(t) - t + Math.log(lanczosSum(z));
}

/** Γ(x), computed directly (not through exp(lnΓ)) so it keeps full relative accuracy near Γ = 1. */
export function gamma(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x === Infinity) return Infinity;
  if (x < 0.5) {
    if (x === -Infinity) return NaN;
    const s = sinPi(x);
    if (s === 0) return NaN; // pole
    return Math.PI / (s * gamma(1 - x));
  }
  if (x > 171.62) return Infinity; // Γ(171.62) ≈ 1.8e308
  const z = x - 1;
  const t = z + LANCZOS_G + 0.5;
  // Split t^(z+½) in two so neither factor overflows before e^(−t) brings it back.
  const half = Math.pow(t, (z + 0.5) / 2);
  return SQRT_2PI * lanczosSum(z) * ((half * Math.exp(-t)) * half);
}

/**
 * ψ(x) = d lnΓ(x)/dx. Recurrence ψ(x) = ψ(x+1) − 1/x up to x ≥ 10 (where the first omitted term, B₁₆/(16x¹⁶), is
 * below 5e-17), then the asymptotic series
 * ψ(x) ~ ln x − 1/(2x) − Σ B₂ₖ/(2k·x^(2k)) (DLMF 5.11.2); reflection ψ(1−x) − ψ(x) = π·cot(πx)
 * (DLMF 5.5.4) for x < 0. NaN at the poles.
 */
export function digamma(x: number): number {
  if (Number.isNaN(x) || x === -Infinity) return NaN;
  if (x === Infinity) return Infinity;
  if (x <= 0) {
    if (x === Math.floor(x)) return NaN;
    // cot(πx) = cos(πx)/sin(πx); use sinPi of x and x+½ (cos(πx) = sin(π(x+½))) for accuracy.
    return digamma(1 - x) - (Math.PI * sinPi(x + 0.5)) / sinPi(x);
  }
  let acc = 0;
  while (x < 10) {
    acc -= 1 / x;
    x += 1;
  }
  const inv2 = 1 / (x * x);
  // Bernoulli-number terms B₂ₖ/(2k): 1/12, −1/120, 1/252, −1/240, 1/132, −691/32760, 1/12.
  const series =
    inv2 *
    (1 / 12 -
      inv2 *
        (1 / 120 -
          inv2 *
            (1 / 252 - inv2 * (1 / 240 - inv2 * (1 / 132 - inv2 * (691 / 32760 - inv2 / 12))))));
  return acc + Math.log(x) - 0.5 / x - series;
}

/**
 * ln B(a, b) = lnΓ(a) + lnΓ(b) − lnΓ(a+b). When the larger argument is ≥ 10 the difference
 * lnΓ(big) − lnΓ(big+small) is formed from Stirling's series, −(big−½)·ln(1 + small/big)
 * − small·ln(big+small) + small + c(big) − c(big+small), instead of subtracting two large numbers.
 */
export function lnBeta(a: number, b: number): number {
  if (!(a > 0) || !(b > 0)) return NaN;
  const big = Math.max(a, b);
  const small = Math.min(a, b);
  if (big < 10) return lnGamma(a) + lnGamma(b) - lnGamma(a + b);
  const s = big + small;
  const ratio =
    -(big - 0.5) * Math.log1p(small / big) -
    small * Math.log(s) +
    small +
    stirlingCorrection(big) -
    stirlingCorrection(s);
  return lnGamma(small) + ratio;
}

/**
 * Stirling correction c(a) = lnΓ(a) − [(a−½)ln a − a + ½ln 2π], by its asymptotic series
 * (DLMF 5.11.1) for a ≥ 10, where the omitted term is below 1e-16. Used to form the prefactors of
 * the incomplete gamma and beta functions without the cancellation of lnΓ against a·ln a.
 */
function stirlingCorrection(a: number): number {
  if (a < 10) return lnGamma(a) - ((a - 0.5) * Math.log(a) - a + LN_SQRT_2PI);
  const i2 = 1 / (a * a);
  return (
    (1 / a) *
    (1 / 12 -
      i2 *
        (1 / 360 -
          i2 * (1 / 1260 - i2 * (1 / 1680 - i2 * (1 / 1188 - i2 * (691 / 360360 - i2 / 156))))))
  );
}

/** ln(1+d) − d, accurate also for small |d| where the subtraction would cancel. */
function log1pmx(d: number): number {
  if (Math.abs(d) > 0.1) return Math.log1p(d) - d;
  // −d²/2 + d³/3 − d⁴/4 + …
  let term = d;
  let sum = 0;
  for (let k = 2; k < 60; k++) {
    term *= -d;
    const add = term / k;
    sum += add;
    if (Math.abs(add) <= EPS * Math.abs(sum)) break;
  }
  return sum;
}

// ---------------------------------------------------------------------------------------------
// Incomplete gamma

let LN_GAMMA_HALF: number | undefined;
/** lnΓ(½) by the same lnGamma, so the value is bit for bit what lnGamma(0.5) gives. */
function lnGammaHalf(): number {
  return (LN_GAMMA_HALF ??= lnGamma(0.5));
}

/** x^a·e^(−x)/Γ(a), the common factor of the series and the continued fraction. */
function gammaPrefactor(a: number, x: number): number {
  // a = ½ is the normal CDF's case (normalCdf), met in every normal quantile: lnΓ(½) computed once.
  if (a < 10) return Math.exp(a * Math.log(x) - x - (a === 0.5 ? lnGammaHalf() : lnGamma(a)));
  // With t = x/a: ln(prefactor) = a·(ln t + 1 − t) + ½ln a − ½ln 2π − c(a), so no large terms
  // cancel; near t = 1 the bracket is ln(1+d) − d with d = (x − a)/a, summed as a series.
  const d = (x - a) / a;
  const bracket = Math.abs(d) < 0.5 ? log1pmx(d) : Math.log(x / a) - d;
  return Math.exp(a * bracket - stirlingCorrection(a)) * Math.sqrt(a / (2 * Math.PI));
}

const MAX_ITER = 100000;

/** P(a, x) by its power series (Numerical Recipes §6.2, `gser`); used for x < a + 1. */
function gammaSeries(a: number, x: number): number {
  let ap = a;
  let del = 1 / a;
  let sum = del;
  for (let n = 0; n < MAX_ITER; n++) {
    ap += 1;
    del *= x / ap;
    sum += del;
    if (Math.abs(del) < Math.abs(sum) * EPS) break;
  }
  return sum * gammaPrefactor(a, x);
}

/** Q(a, x) by its continued fraction, modified Lentz (Numerical Recipes §6.2, `gcf`); x ≥ a + 1. */
function gammaContinuedFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < MAX_ITER; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return h * gammaPrefactor(a, x);
}

/**
 * Regularized lower incomplete gamma P(a, x) = γ(a, x)/Γ(a), a > 0, x ≥ 0: the gamma CDF.
 * Series below x = a + 1, continued fraction above (Numerical Recipes, 3rd ed., §6.2).
 * Relative accuracy about 1e-14 for a ≥ ½; for a < ½ the complement Q loses digits where x < 1.
 */
export function regularizedGammaP(a: number, x: number): number {
  if (!(a > 0) || Number.isNaN(x) || x < 0) return NaN;
  if (x === 0) return 0;
  if (x === Infinity) return 1;
  if (a === Infinity) return 0;
  return x < a + 1 ? gammaSeries(a, x) : 1 - gammaContinuedFraction(a, x);
}

/** Regularized upper incomplete gamma Q(a, x) = 1 − P(a, x), accurate in the upper tail. */
export function regularizedGammaQ(a: number, x: number): number {
  if (!(a > 0) || Number.isNaN(x) || x < 0) return NaN;
  if (x === 0) return 1;
  if (x === Infinity) return 0;
  if (a === Infinity) return 1;
  return x < a + 1 ? 1 - gammaSeries(a, x) : gammaContinuedFraction(a, x);
}

// ---------------------------------------------------------------------------------------------
// Normal distribution

/** Standard normal density φ(z). */
export function normalPdf(z: number): number {
  return Math.exp(-0.5 * z * z) / SQRT_2PI;
}

/**
 * Standard normal CDF Φ(z), accurate relative to itself in both tails: Φ(z) = ½·Q(½, z²/2) for
 * z < 0 (erfc(u) = Q(½, u²), DLMF 7.11.2 with 8.4.14), and 1 − Φ(−z) above.
 */
export function normalCdf(z: number): number {
  if (Number.isNaN(z)) return NaN;
  const x = 0.5 * z * z;
  return z < 0 ? 0.5 * regularizedGammaQ(0.5, x) : 0.5 + 0.5 * regularizedGammaP(0.5, x);
}

// P. J. Acklam's rational approximation of Φ⁻¹ (2003; relative error below 1.15e-9), refined below.
// Coefficients from memory; the Halley step and the tests against @stdlib guard the result.
// Acklam's coefficients as plain constants (a hot path of every Monte Carlo trial).
const A0 = -3.969683028665376e1, A1 = 2.209460984245205e2, A2 = -2.759285104469687e2, A3 = 1.38357751867269e2;
const A4 = -3.066479806614716e1, A5 = 2.506628277459239;
const B0 = -5.447609879822406e1, B1 = 1.615858368580409e2, B2 = -1.556989798598866e2, B3 = 6.680131188771972e1;
const B4 = -1.328068155288572e1;
const C0 = -7.784894002430293e-3, C1 = -3.223964580411365e-1, C2 = -2.400758277161838, C3 = -2.549732539343734;
const C4 = 4.374664141464968, C5 = 2.938163982698783;
const D0 = 7.784695709041462e-3, D1 = 3.224671290700398e-1, D2 = 2.445134137142996, D3 = 3.754408661907416;

/** Acklam's approximation for p ≤ ½ (the lower half; the upper half follows by symmetry). */
function acklamLower(p: number): number {
  if (p < 0.02425) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (
      (((((C0 * q + C1) * q + C2) * q + C3) * q + C4) * q + C5) /
      ((((D0 * q + D1) * q + D2) * q + D3) * q + 1)
    );
  }
  const q = p - 0.5;
  const r = q * q;
  return (
    ((((((A0 * r + A1) * r + A2) * r + A3) * r + A4) * r + A5) * q) /
    (((((B0 * r + B1) * r + B2) * r + B3) * r + B4) * r + 1)
  );
}

/**
 * Standard normal quantile Φ⁻¹(p). Acklam's approximation (relative error < 1.15e-9) polished by
 * one Halley step on Φ(x) − p, which triples the number of correct digits, so the result is as
 * accurate as Φ itself (about 1e-14 relative) over (1e-300, 1 − 1e-16); for subnormal p, below
 * 2.2e-308, the unrefined approximation is returned. For p > ½ it returns
 * −Φ⁻¹(1 − p); 1 − p is exact there (Sterbenz), so the upper tail loses nothing.
 */
export function normalQuantile(p: number): number {
  if (Number.isNaN(p) || p < 0 || p > 1) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  if (p > 0.5) return -normalQuantile(1 - p);
  let x = acklamLower(p);
  // Halley step for f(x) = Φ(x) − p: f' = φ(x), f'' = −x·φ(x), so x ← x − u/(1 + x·u/2), u = f/φ.
  const e = normalCdf(x) - p;
  const u = e * SQRT_2PI * Math.exp(0.5 * x * x);
  // Below p ≈ 1e-308 (subnormal) e^(x²/2) overflows; Acklam's value (1e-9 relative) is kept there.
  if (Number.isFinite(u)) x -= u / (1 + 0.5 * x * u);
  return x;
}

// ---------------------------------------------------------------------------------------------
// Quantile solver shared by the gamma and beta quantiles

/**
 * Safeguarded Halley iteration for an increasing CDF-like function: `step(x)` returns
 * [f(x), f(x)/f'(x), f''(x)/f'(x)]. A bracket [lo, hi] is kept from the sign of f; a step that
 * leaves it is replaced by shrinking towards the bracket (geometrically when it spans decades, so a
 * quantile of 1e-200 is still reached in tens of steps).
 */
function solveIncreasing(
  step: (x: number) => [number, number, number],
  x0: number,
  lo0: number,
  hi0: number,
): number {
  let lo = lo0;
  let hi = hi0;
  let x = x0;
  for (let iter = 0; iter < 200; iter++) {
    const [f, ratio, curv] = step(x);
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    const denom = 1 - 0.5 * ratio * curv;
    let next = denom > 0.5 && Number.isFinite(denom) ? x - ratio / denom : x - ratio;
    // Converged: the step is at rounding level (it may even round back onto x itself).
    if (Number.isFinite(next) && Math.abs(next - x) <= 4 * EPS * Math.abs(x)) return next;
    if (!(next > lo && next < hi) || !Number.isFinite(next)) {
      if (hi === Infinity) next = lo * 4;
      else if (lo === lo0 && lo0 === 0) next = hi / 4;
      else if (hi === hi0 && hi0 === 1) next = 1 - (1 - lo) / 4;
      else next = hi / lo > 4 && lo > 0 ? Math.sqrt(lo * hi) : 0.5 * (lo + hi);
    }
    if (hi - lo <= 4 * EPS * Math.abs(next)) return next;
    x = next;
  }
  return x;
}

/**
 * Quantile of the gamma distribution with the given shape and scale: solves P(shape, x/scale) = p.
 * Starting value from the Wilson–Hilferty cube-root approximation (shape > 1) or the small-shape
 * expansion of Numerical Recipes §6.2 (`invgammp`), then safeguarded Halley steps. Above the median
 * it solves Q = 1 − p instead, so upper quantiles keep their accuracy.
 */
export function gammaQuantile(p: number, shape: number, scale: number): number {
  if (Number.isNaN(p) || p < 0 || p > 1 || !(shape > 0) || !(scale > 0)) return NaN;
  if (p === 0) return 0;
  if (p === 1) return Infinity;
  const a = shape;
  const upper = p > 0.5;
  const q = 1 - p;
  let x0: number;
  if (a > 1) {
    const z = normalQuantile(p);
    const c = 1 - 1 / (9 * a) + z / (3 * Math.sqrt(a));
    x0 = a * c * c * c;
    if (!(x0 > 0)) x0 = Math.exp((Math.log(p) + lnGamma(a + 1)) / a); // P ≈ x^a/Γ(a+1)
  } else {
    const t = 1 - a * (0.253 + a * 0.12);
    x0 = p < t ? Math.pow(p / t, 1 / a) : 1 - Math.log(1 - (p - t) / (1 - t));
  }
  if (!(x0 > 0) || !Number.isFinite(x0)) x0 = a;
  const lnGammaA = lnGamma(a);
  const x = solveIncreasing(
    (x) => {
      const f = upper ? q - regularizedGammaQ(a, x) : regularizedGammaP(a, x) - p;
      const dens = Math.exp((a - 1) * Math.log(x) - x - lnGammaA);
      return [f, f / dens, (a - 1) / x - 1];
    },
    x0,
    0,
    Infinity,
  );
  return x * scale;
}

/** Quantile of the chi-square distribution with k degrees of freedom (gamma with shape k/2, scale 2). */
export function chiSquareQuantile(p: number, k: number): number {
  return gammaQuantile(p, k / 2, 2);
}

// ---------------------------------------------------------------------------------------------
// Incomplete beta

/** x^a·(1−x)^b / B(a, b), formed without cancellation when a and b are both large. */
function betaPrefactor(x: number, a: number, b: number): number {
  if (a < 10 || b < 10) {
    return Math.exp(a * Math.log(x) + b * Math.log1p(-x) - lnBeta(a, b));
  }
  // With s = a+b, x₀ = a/s: a·ln(x/x₀) + b·ln((1−x)/(1−x₀)) = a·log1pmx(d₁) + b·log1pmx(d₂), the
  // linear terms cancelling exactly; the rest of lnB comes from the Stirling corrections.
  const s = a + b;
  const x0 = a / s;
  const diff = x - x0;
  const d1 = diff / x0;
  const d2 = -diff / (b / s);
  // ln(1+d) − d, taking the logarithm of the ratio itself when it is far from 1 (where forming
  // 1 + d from d would lose the digits of a small x or 1 − x).
  const term1 = Math.abs(d1) < 0.5 ? log1pmx(d1) : Math.log(x / x0) - d1;
  const term2 = Math.abs(d2) < 0.5 ? log1pmx(d2) : Math.log((1 - x) / (b / s)) - d2;
  const lnPart =
    a * term1 +
    b * term2 -
    stirlingCorrection(a) -
    stirlingCorrection(b) +
    stirlingCorrection(s);
  return Math.exp(lnPart) * Math.sqrt((a * b) / (2 * Math.PI * s));
}

/** Continued fraction for I_x(a, b), modified Lentz (Numerical Recipes §6.4, `betacf`). */
function betaContinuedFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m < MAX_ITER; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return h;
}

/**
 * Regularized incomplete beta I_x(a, b), the beta CDF: continued fraction on the side of
 * x = (a+1)/(a+b+2) where it converges fast, symmetry I_x(a,b) = 1 − I_{1−x}(b,a) on the other
 * (Numerical Recipes, 3rd ed., §6.4).
 */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (!(a > 0) || !(b > 0) || Number.isNaN(x) || x < 0 || x > 1) return NaN;
  if (x === 0) return 0;
  if (x === 1) return 1;
  if (x < (a + 1) / (a + b + 2)) return (betaPrefactor(x, a, b) * betaContinuedFraction(x, a, b)) / a;
  const y = 1 - x;
  return 1 - (betaPrefactor(y, b, a) * betaContinuedFraction(y, b, a)) / b;
}

/**
 * Quantile of the beta distribution: solves I_x(a, b) = p. Start from Abramowitz & Stegun 26.5.22
 * (a, b ≥ 1) or the power-law tails of Numerical Recipes §6.4 (`invbetai`), then safeguarded
 * Halley steps. Above the median it solves the mirrored problem 1 − x = I⁻¹(1 − p; b, a).
 */
export function betaQuantile(p: number, a: number, b: number): number {
  if (Number.isNaN(p) || p < 0 || p > 1 || !(a > 0) || !(b > 0)) return NaN;
  if (p === 0) return 0;
  if (p === 1) return 1;
  if (p > 0.5) return 1 - betaQuantileLower(1 - p, b, a);
  return betaQuantileLower(p, a, b);
}

function betaQuantileLower(p: number, a: number, b: number): number {
  let x0: number;
  if (a >= 1 && b >= 1) {
    const y = -normalQuantile(p); // upper normal quantile: Q(y) = p
    const lambda = (y * y - 3) / 6;
    const h = 2 / (1 / (2 * a - 1) + 1 / (2 * b - 1));
    const w =
      (y * Math.sqrt(h + lambda)) / h -
      (1 / (2 * b - 1) - 1 / (2 * a - 1)) * (lambda + 5 / 6 - 2 / (3 * h));
    x0 = a / (a + b * Math.exp(2 * w));
  } else {
    const lna = Math.log(a / (a + b));
    const lnb = Math.log(b / (a + b));
    const t = Math.exp(a * lna) / a;
    const u = Math.exp(b * lnb) / b;
    const w = t + u;
    x0 = p < t / w ? Math.pow(a * w * p, 1 / a) : 1 - Math.pow(b * w * (1 - p), 1 / b);
  }
  if (!(x0 > 0 && x0 < 1)) x0 = a / (a + b);
  const lnB = lnBeta(a, b);
  return solveIncreasing(
    (x) => {
      const f = regularizedBeta(x, a, b) - p;
      const dens = Math.exp((a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x) - lnB);
      return [f, f / dens, (a - 1) / x - (b - 1) / (1 - x)];
    },
    x0,
    0,
    1,
  );
}
