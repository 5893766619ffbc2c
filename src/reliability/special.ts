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

/**
 * The parts of the incomplete gamma's prefactor that depend on the shape a alone, computed once per
 * shape: a quantile solve evaluates P(a, x) several times, and a sampled gamma distribution does so
 * in every Monte Carlo trial, at the same a. Hoisting them changes no bit: the prefactor is the
 * same expression on the same operands.
 */
interface GammaShape {
  readonly a: number;
  /** lnΓ(a), used below a = 10. */
  readonly lnGammaA: number;
  /** From a = 10: the Stirling correction c(a) and √(a/2π). */
  readonly stirling: number;
  readonly root: number;
}

let HALF_SHAPE: GammaShape | undefined;

function gammaShape(a: number): GammaShape {
  // a = ½ is the normal CDF's case (normalCdf): made once.
  if (a === 0.5) return (HALF_SHAPE ??= { a, lnGammaA: lnGamma(0.5), stirling: NaN, root: NaN });
  if (a < 10) return { a, lnGammaA: lnGamma(a), stirling: NaN, root: NaN };
  return { a, lnGammaA: NaN, stirling: stirlingCorrection(a), root: Math.sqrt(a / (2 * Math.PI)) };
}

/** x^a·e^(−x)/Γ(a), the common factor of the series and the continued fraction. */
function gammaPrefactor(s: GammaShape, x: number): number {
  const a = s.a;
  if (a < 10) return Math.exp(a * Math.log(x) - x - s.lnGammaA);
  // With t = x/a: ln(prefactor) = a·(ln t + 1 − t) + ½ln a − ½ln 2π − c(a), so no large terms
  // cancel; near t = 1 the bracket is ln(1+d) − d with d = (x − a)/a, summed as a series.
  const d = (x - a) / a;
  const bracket = Math.abs(d) < 0.5 ? log1pmx(d) : Math.log(x / a) - d;
  return Math.exp(a * bracket - s.stirling) * s.root;
}

const MAX_ITER = 100000;

/** P(a, x) by its power series (Numerical Recipes §6.2, `gser`); used for x < a + 1. */
function gammaSeries(s: GammaShape, x: number): number {
  let ap = s.a;
  let del = 1 / ap;
  let sum = del;
  for (let n = 0; n < MAX_ITER; n++) {
    ap += 1;
    del *= x / ap;
    sum += del;
    if (Math.abs(del) < Math.abs(sum) * EPS) break;
  }
  return sum * gammaPrefactor(s, x);
}

/** Q(a, x) by its continued fraction, modified Lentz (Numerical Recipes §6.2, `gcf`); x ≥ a + 1. */
function gammaContinuedFraction(s: GammaShape, x: number): number {
  const a = s.a;
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
  return h * gammaPrefactor(s, x);
}

/** P(a, x) for a valid shape and x ≥ 0 (the checks are the callers'). */
function lowerGamma(s: GammaShape, x: number): number {
  if (x === 0) return 0;
  if (x === Infinity) return 1;
  return x < s.a + 1 ? gammaSeries(s, x) : 1 - gammaContinuedFraction(s, x);
}

/** Q(a, x) for a valid shape and x ≥ 0. */
function upperGamma(s: GammaShape, x: number): number {
  if (x === 0) return 1;
  if (x === Infinity) return 0;
  return x < s.a + 1 ? 1 - gammaSeries(s, x) : gammaContinuedFraction(s, x);
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
  return lowerGamma(gammaShape(a), x);
}

/** Regularized upper incomplete gamma Q(a, x) = 1 − P(a, x), accurate in the upper tail. */
export function regularizedGammaQ(a: number, x: number): number {
  if (!(a > 0) || Number.isNaN(x) || x < 0) return NaN;
  if (x === 0) return 1;
  if (x === Infinity) return 0;
  if (a === Infinity) return 1;
  return upperGamma(gammaShape(a), x);
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

// M. J. Wichura, "Algorithm AS 241: The percentage points of the normal distribution", Applied
// Statistics 37 (1988) 477–484, function PPND16: three rational functions of degree 7, accurate to
// about 1 part in 10^16. Coefficients from memory; the tests hold the result to @stdlib, to the
// round trip through normalCdf, and to Φ computed in 70-digit arithmetic. Plain constants: every
// Monte Carlo draw of a lognormal goes through here.
// Central region |p − ½| ≤ 0.425, in r = 0.180625 − (p − ½)²: Φ⁻¹ = (p − ½)·A(r)/B(r).
const A0 = 3.387132872796366608, A1 = 1.3314166789178437745e2, A2 = 1.9715909503065514427e3, A3 = 1.3731693765509461125e4;
const A4 = 4.5921953931549871457e4, A5 = 6.7265770927008700853e4, A6 = 3.3430575583588128105e4, A7 = 2.5090809287301226727e3;
const B1 = 4.2313330701600911252e1, B2 = 6.871870074920579083e2, B3 = 5.3941960214247511077e3, B4 = 2.1213794301586595867e4;
const B5 = 3.930789580009271061e4, B6 = 2.8729085735721942674e4, B7 = 5.226495278852854561e3;
// Near tail, r = √(−ln p) ≤ 5, in r − 1.6: Φ⁻¹ = −C/D.
const C0 = 1.42343711074968357734, C1 = 4.6303378461565452959, C2 = 5.7694972214606914055, C3 = 3.64784832476320460504;
const C4 = 1.27045825245236838258, C5 = 2.4178072517745061177e-1, C6 = 2.27238449892691845833e-2, C7 = 7.7454501427834140764e-4;
const D1 = 2.05319162663775882187, D2 = 1.6763848301838038494, D3 = 6.8976733498510000455e-1, D4 = 1.4810397642748007459e-1;
const D5 = 1.51986665636164571966e-2, D6 = 5.475938084995344946e-4, D7 = 1.05075007164441684324e-9;
// Far tail, r > 5, in r − 5: Φ⁻¹ = −E/F.
const E0 = 6.6579046435011037772, E1 = 5.4637849111641143699, E2 = 1.7848265399172913358, E3 = 2.9656057182850489123e-1;
const E4 = 2.6532189526576123093e-2, E5 = 1.2426609473880784386e-3, E6 = 2.71155556874348757815e-5, E7 = 2.01033439929228813265e-7;
const F1 = 5.9983220655588793769e-1, F2 = 1.3692988092273580531e-1, F3 = 1.48753612908506148525e-2, F4 = 7.868691311456132591e-4;
const F5 = 1.8463183175100546818e-5, F6 = 1.4215117583164458887e-7, F7 = 2.04426310338993978564e-15;

/** AS 241 for p ≤ ½ (the upper half follows by symmetry). */
function wichuraLower(p: number): number {
  const q = p - 0.5;
  if (q >= -0.425) {
    const r = 0.180625 - q * q;
    return (
      (q * (((((((A7 * r + A6) * r + A5) * r + A4) * r + A3) * r + A2) * r + A1) * r + A0)) /
      (((((((B7 * r + B6) * r + B5) * r + B4) * r + B3) * r + B2) * r + B1) * r + 1)
    );
  }
  let r = Math.sqrt(-Math.log(p));
  if (r <= 5) {
    r -= 1.6;
    return -(
      (((((((C7 * r + C6) * r + C5) * r + C4) * r + C3) * r + C2) * r + C1) * r + C0) /
      (((((((D7 * r + D6) * r + D5) * r + D4) * r + D3) * r + D2) * r + D1) * r + 1)
    );
  }
  r -= 5;
  return -(
    (((((((E7 * r + E6) * r + E5) * r + E4) * r + E3) * r + E2) * r + E1) * r + E0) /
    (((((((F7 * r + F6) * r + F5) * r + F4) * r + F3) * r + F2) * r + F1) * r + 1)
  );
}

/** Below this p (r = √(−ln p) > 5) the far-tail value is refined by one Halley step on Φ. */
const FAR_TAIL = Math.exp(-25);

/**
 * Standard normal quantile Φ⁻¹(p) by AS 241 (above): about 1e-16 relative over the central and
 * near-tail regions, with no special function evaluated. In the far tail (p < e^−25 ≈ 1.4e-11,
 * which a uniform with 53 random bits almost never reaches) one Halley step on Φ(x) − p brings the
 * value to Φ's own accuracy (AS 241 alone is a few units in the last place off near p = 1e-300);
 * for subnormal p, below 2.2e-308, AS 241's value is kept. For p > ½ it returns −Φ⁻¹(1 − p);
 * 1 − p is exact there (Sterbenz), so the upper tail loses nothing and the two halves mirror
 * exactly.
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) return NaN;
  return p > 0.5 ? -lowerNormalQuantile(1 - p) : lowerNormalQuantile(p);
}

/** normalQuantile for 0 ≤ p ≤ ½. */
function lowerNormalQuantile(p: number): number {
  if (p === 0) return -Infinity;
  let x = wichuraLower(p);
  if (p < FAR_TAIL) {
    // Halley step for f(x) = Φ(x) − p: f' = φ(x), f'' = −x·φ(x), so x ← x − u/(1 + x·u/2), u = f/φ.
    const e = normalCdf(x) - p;
    const u = e * SQRT_2PI * Math.exp(0.5 * x * x);
    // Below p ≈ 1e-308 (subnormal) e^(x²/2) overflows; AS 241's value is kept there.
    if (Number.isFinite(u)) x -= u / (1 + 0.5 * x * u);
  }
  return x;
}

// ---------------------------------------------------------------------------------------------
// Quantile solver shared by the gamma and beta quantiles

/** What a step needs at x, written by `at(x)`: f(x), f(x)/f′(x), f″(x)/f′(x) and f‴(x)/f′(x). */
interface IncreasingEquation {
  at(x: number): void;
  f: number;
  ratio: number;
  curvature: number;
  third: number;
}

/**
 * After a step of a high-order method the remaining error is about |r|·m^k, with r = f/f′ the
 * Newton step, m = max(|r·f″/f′|, |r|·√|f‴/f′|) how far from linear f is over that step (the
 * higher derivatives of these smooth CDFs scale with the first two), and k = 2 for Halley's step,
 * 3 for the fourth-order one. When that is below a tenth of a unit in the last place of x (or of
 * 1 − x, for a beta quantile near 1), the solve stops after applying the step instead of paying
 * one more evaluation to see the next step at rounding level.
 */
const SETTLED = 1e-17;
/** The fourth-order step is taken only this close to the root (m below it), where its series converges fast. */
const NEAR = 0.1;

/**
 * Safeguarded iteration for an increasing CDF-like function. Near the root, one step of the
 * inverse function's Taylor series to third order in r = f/f′ (series reversion of
 * f(x + Δ) = 0: Δ = −r·(1 + c₂r + (2c₂² − c₃)r²), c₂ = f″/2f′, c₃ = f‴/6f′; fourth-order
 * convergence); further out, Halley's step (cubic), or Newton's where Halley's denominator is
 * unsafe. A bracket [lo, hi] is kept from the sign of f; a step that leaves it is replaced by
 * shrinking towards the bracket (geometrically when it spans decades, so a quantile of 1e-200 is
 * still reached in tens of steps). The equation is an object prepared once (no closure or array is
 * made per step).
 */
function solveIncreasing(eq: IncreasingEquation, x0: number, lo0: number, hi0: number): number {
  let lo = lo0;
  let hi = hi0;
  let x = x0;
  for (let iter = 0; iter < 200; iter++) {
    eq.at(x);
    const f = eq.f;
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    const r = eq.ratio;
    const rc = r * eq.curvature;
    // How far from linear f is over the step (see SETTLED).
    const m = Math.max(Math.abs(rc), Math.abs(r) * Math.sqrt(Math.abs(eq.third)));
    let next: number;
    let left: number;
    if (m < NEAR) {
      const c2 = 0.5 * eq.curvature;
      const c3 = eq.third / 6;
      next = x - r * (1 + c2 * r + (2 * c2 * c2 - c3) * r * r);
      left = Math.abs(r) * m * m * m;
    } else {
      const denom = 1 - 0.5 * rc;
      const halley = denom > 0.5 && Number.isFinite(denom);
      next = halley ? x - r / denom : x - r;
      left = halley ? Math.abs(r) * m * m : Infinity;
    }
    if (Number.isFinite(next)) {
      // Converged: the step is at rounding level (it may even round back onto x itself).
      if (Math.abs(next - x) <= 4 * EPS * Math.abs(x)) return next;
      // What the step leaves is far below rounding, against the distance to the nearer end of the domain.
      const room = hi0 === Infinity ? Math.abs(x) : Math.min(Math.abs(x), hi0 - x);
      if (left <= SETTLED * room && next > lo && next < hi) return next;
    }
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
 * The gamma quantile at one shape (unit scale), prepared for many probabilities: a sampled gamma
 * distribution draws one per Monte Carlo trial. Solves P(a, x) = p from the Wilson–Hilferty
 * cube-root approximation (a > 1) or the small-shape expansion of Numerical Recipes §6.2
 * (`invgammp`), then safeguarded Halley steps. Above the median it solves Q = 1 − p instead, so
 * upper quantiles keep their accuracy.
 */
export class GammaInverse implements IncreasingEquation {
  f = 0;
  ratio = 0;
  curvature = 0;
  third = 0;
  private readonly shape: GammaShape;
  private readonly lnGammaA: number;
  /** Wilson–Hilferty: 1 − 1/(9a) and 3√a. */
  private readonly whCentre: number;
  private readonly whScale: number;
  /** Numerical Recipes' small-shape split point t = 1 − a(0.253 + 0.12a). */
  private readonly smallT: number;
  private target = 0;
  private upper = false;

  constructor(readonly a: number) {
    this.shape = gammaShape(a);
    this.lnGammaA = lnGamma(a);
    this.whCentre = 1 - 1 / (9 * a);
    this.whScale = 3 * Math.sqrt(a);
    this.smallT = 1 - a * (0.253 + a * 0.12);
  }

  /** The x (unit scale) with P(a, x) = p; NaN for p outside [0, 1] or an invalid shape. */
  quantile(p: number): number {
    const a = this.a;
    if (Number.isNaN(p) || p < 0 || p > 1 || !(a > 0)) return NaN;
    if (p === 0) return 0;
    if (p === 1) return Infinity;
    let x0: number;
    if (a > 1) {
      const z = normalQuantile(p);
      const c = this.whCentre + z / this.whScale;
      x0 = a * c * c * c;
      if (!(x0 > 0)) x0 = Math.exp((Math.log(p) + lnGamma(a + 1)) / a); // P ≈ x^a/Γ(a+1)
    } else {
      const t = this.smallT;
      x0 = p < t ? Math.pow(p / t, 1 / a) : 1 - Math.log(1 - (p - t) / (1 - t));
    }
    if (!(x0 > 0) || !Number.isFinite(x0)) x0 = a;
    this.upper = p > 0.5;
    this.target = this.upper ? 1 - p : p;
    return solveIncreasing(this, x0, 0, Infinity);
  }

  /** @internal the solver's step. */
  at(x: number): void {
    const a = this.a;
    const f = this.upper ? this.target - upperGamma(this.shape, x) : lowerGamma(this.shape, x) - this.target;
    const dens = Math.exp((a - 1) * Math.log(x) - x - this.lnGammaA);
    this.f = f;
    this.ratio = f / dens;
    // (ln f′)′ = (a − 1)/x − 1; f‴/f′ = g² + g′ with g′ = −(a − 1)/x².
    const g = (a - 1) / x - 1;
    this.curvature = g;
    this.third = g * g - (a - 1) / (x * x);
  }
}

/** Quantile of the gamma distribution with the given shape and scale (GammaInverse, times the scale). */
export function gammaQuantile(p: number, shape: number, scale: number): number {
  if (Number.isNaN(p) || p < 0 || p > 1 || !(shape > 0) || !(scale > 0)) return NaN;
  return new GammaInverse(shape).quantile(p) * scale;
}

/** Quantile of the chi-square distribution with k degrees of freedom (gamma with shape k/2, scale 2). */
export function chiSquareQuantile(p: number, k: number): number {
  return gammaQuantile(p, k / 2, 2);
}

// ---------------------------------------------------------------------------------------------
// Incomplete beta

/**
 * The parts of x^a·(1−x)^b/B(a, b) that depend on a and b alone, computed once per pair (as for
 * the gamma above; the same expressions on the same operands, so no bit changes). The order of a
 * and b matters: the beta CDF uses the pair and its mirror.
 */
interface BetaShape {
  readonly a: number;
  readonly b: number;
  /** ln B(a, b), used when a or b is below 10. */
  readonly lnB: number;
  /** Both from 10: the Stirling corrections c(a), c(b), c(a+b) and √(ab/(2π(a+b))). */
  readonly stirlingA: number;
  readonly stirlingB: number;
  readonly stirlingSum: number;
  readonly root: number;
}

function betaShape(a: number, b: number): BetaShape {
  if (a < 10 || b < 10) return { a, b, lnB: lnBeta(a, b), stirlingA: NaN, stirlingB: NaN, stirlingSum: NaN, root: NaN };
  const s = a + b;
  return {
    a,
    b,
    lnB: NaN,
    stirlingA: stirlingCorrection(a),
    stirlingB: stirlingCorrection(b),
    stirlingSum: stirlingCorrection(s),
    root: Math.sqrt((a * b) / (2 * Math.PI * s)),
  };
}

/** x^a·(1−x)^b / B(a, b), formed without cancellation when a and b are both large. */
function betaPrefactor(x: number, sh: BetaShape): number {
  const { a, b } = sh;
  if (a < 10 || b < 10) {
    return Math.exp(a * Math.log(x) + b * Math.log1p(-x) - sh.lnB);
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
  const lnPart = a * term1 + b * term2 - sh.stirlingA - sh.stirlingB + sh.stirlingSum;
  return Math.exp(lnPart) * sh.root;
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

/** I_x(a, b) for valid a, b and x ∈ [0, 1], from the pair's shape and its mirror's (b, a). */
function incompleteBeta(x: number, ab: BetaShape, ba: BetaShape): number {
  if (x === 0) return 0;
  if (x === 1) return 1;
  const { a, b } = ab;
  if (x < (a + 1) / (a + b + 2)) return (betaPrefactor(x, ab) * betaContinuedFraction(x, a, b)) / a;
  const y = 1 - x;
  return 1 - (betaPrefactor(y, ba) * betaContinuedFraction(y, b, a)) / b;
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
  // Only the side the continued fraction is taken on needs its shape.
  if (x < (a + 1) / (a + b + 2)) return (betaPrefactor(x, betaShape(a, b)) * betaContinuedFraction(x, a, b)) / a;
  const y = 1 - x;
  return 1 - (betaPrefactor(y, betaShape(b, a)) * betaContinuedFraction(y, b, a)) / b;
}

/**
 * The beta quantile for one pair (a, b), prepared for many probabilities: solves I_x(a, b) = p.
 * Start from Abramowitz & Stegun 26.5.22 (a, b ≥ 1) or the power-law tails of Numerical Recipes
 * §6.4 (`invbetai`), then safeguarded Halley steps. Above the median it solves the mirrored
 * problem 1 − x = I⁻¹(1 − p; b, a).
 */
export class BetaInverse {
  private readonly lower: BetaLowerInverse;
  private readonly mirrored: BetaLowerInverse;

  constructor(
    readonly a: number,
    readonly b: number,
  ) {
    const ab = betaShape(a, b);
    const ba = betaShape(b, a);
    this.lower = new BetaLowerInverse(ab, ba);
    this.mirrored = new BetaLowerInverse(ba, ab);
  }

  /** The x with I_x(a, b) = p; NaN for p outside [0, 1] or invalid a, b. */
  quantile(p: number): number {
    if (Number.isNaN(p) || p < 0 || p > 1 || !(this.a > 0) || !(this.b > 0)) return NaN;
    if (p === 0) return 0;
    if (p === 1) return 1;
    if (p > 0.5) return 1 - this.mirrored.quantile(1 - p);
    return this.lower.quantile(p);
  }
}

/** The lower half of the beta quantile, p ≤ ½, for one ordered pair. */
class BetaLowerInverse implements IncreasingEquation {
  f = 0;
  ratio = 0;
  curvature = 0;
  third = 0;
  private target = 0;
  private readonly a: number;
  private readonly b: number;
  /** A&S 26.5.22: h and the difference of the reciprocals 1/(2b−1) − 1/(2a−1). */
  private readonly h: number;
  private readonly asymmetry: number;
  /** Numerical Recipes' tail weights t, u and their sum. */
  private readonly t: number;
  private readonly u: number;
  /** ln B(a, b) of the density. */
  private readonly lnB: number;

  constructor(
    private readonly ab: BetaShape,
    private readonly ba: BetaShape,
  ) {
    const { a, b } = ab;
    this.a = a;
    this.b = b;
    this.h = 2 / (1 / (2 * a - 1) + 1 / (2 * b - 1));
    this.asymmetry = 1 / (2 * b - 1) - 1 / (2 * a - 1);
    this.t = Math.exp(a * Math.log(a / (a + b))) / a;
    this.u = Math.exp(b * Math.log(b / (a + b))) / b;
    this.lnB = lnBeta(a, b);
  }

  quantile(p: number): number {
    const { a, b } = this;
    let x0: number;
    if (a >= 1 && b >= 1) {
      const y = -normalQuantile(p); // upper normal quantile: Q(y) = p
      const lambda = (y * y - 3) / 6;
      const h = this.h;
      const w = (y * Math.sqrt(h + lambda)) / h - this.asymmetry * (lambda + 5 / 6 - 2 / (3 * h));
      x0 = a / (a + b * Math.exp(2 * w));
    } else {
      const w = this.t + this.u;
      x0 = p < this.t / w ? Math.pow(a * w * p, 1 / a) : 1 - Math.pow(b * w * (1 - p), 1 / b);
    }
    if (!(x0 > 0 && x0 < 1)) x0 = a / (a + b);
    this.target = p;
    return solveIncreasing(this, x0, 0, 1);
  }

  /** @internal the solver's step. */
  at(x: number): void {
    const { a, b } = this;
    const f = incompleteBeta(x, this.ab, this.ba) - this.target;
    const dens = Math.exp((a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x) - this.lnB);
    this.f = f;
    this.ratio = f / dens;
    // (ln f′)′ = (a − 1)/x − (b − 1)/(1 − x); f‴/f′ = g² + g′ with g′ = −(a − 1)/x² − (b − 1)/(1 − x)².
    const y = 1 - x;
    const g = (a - 1) / x - (b - 1) / y;
    this.curvature = g;
    this.third = g * g - (a - 1) / (x * x) - (b - 1) / (y * y);
  }
}

/** Quantile of the beta distribution (BetaInverse). */
export function betaQuantile(p: number, a: number, b: number): number {
  if (Number.isNaN(p) || p < 0 || p > 1 || !(a > 0) || !(b > 0)) return NaN;
  return new BetaInverse(a, b).quantile(p);
}
