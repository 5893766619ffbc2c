// An independent oracle for the standard normal CDF: Φ(z) = ½(1 + erf(z/√2)) with erf summed from
// its Maclaurin series, erf(x) = (2/√π) Σₙ (−1)ⁿ x^(2n+1)/(n!(2n+1)) (DLMF 7.6.1), in fixed-point
// integer arithmetic with 70 decimal digits (BigInt), so rounding never reaches the 17 digits a
// double holds. The alternating series cancels up to e^(z²/2) before it converges; for |z| ≤ 9
// that costs at most 18 digits, leaving 30 or more beyond a double's. π to 100 digits from memory
// (checked below against Math.PI, which pins the first 16).
const DIGITS = 70n;
const ONE = 10n ** DIGITS;
const PI_DIGITS = '3141592653589793238462643383279502884197169399375105820974944592307816406286';

function isqrt(n: bigint): bigint {
  if (n < 2n) return n;
  let x = BigInt(Math.floor(Math.sqrt(Number(n))));
  for (;;) {
    const y = (x + n / x) >> 1n;
    if (y >= x - 1n && y <= x + 1n) {
      // Settle on the floor of the root.
      let r = y;
      while (r * r > n) r -= 1n;
      while ((r + 1n) * (r + 1n) <= n) r += 1n;
      return r;
    }
    x = y;
  }
}

const PI = (BigInt(PI_DIGITS) * ONE) / 10n ** BigInt(PI_DIGITS.length - 1);
const SQRT_PI = isqrt(PI * ONE);
const SQRT_2 = isqrt(2n * ONE * ONE);

/** A double as a fixed-point integer (exact up to the 70th digit). */
function toFixed(x: number): bigint {
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, x);
  const bits = view.getBigUint64(0);
  const negative = bits >> 63n === 1n;
  const exponent = Number((bits >> 52n) & 0x7ffn);
  if (exponent === 0) return 0n;
  const mantissa = (bits & ((1n << 52n) - 1n)) | (1n << 52n);
  const e = exponent - 1075;
  const magnitude = e >= 0 ? (mantissa << BigInt(e)) * ONE : (mantissa * ONE) >> BigInt(-e);
  return negative ? -magnitude : magnitude;
}

/** Φ(z) as a fixed-point integer (scaled by 10^70), for |z| ≤ 9. */
export function normalCdfFixed(z: number): bigint {
  if (!(Math.abs(z) <= 9)) throw new RangeError(`the series oracle covers |z| ≤ 9, got ${z}`);
  const x = (toFixed(z) * ONE) / SQRT_2;
  const x2 = (x * x) / ONE;
  let term = x; // (−1)ⁿ x^(2n+1)/n!
  let sum = 0n;
  for (let n = 0n; term !== 0n; n += 1n) {
    sum += term / (2n * n + 1n);
    term = (-term * x2) / ONE / (n + 1n);
  }
  const erf = (2n * sum * ONE) / SQRT_PI;
  return (ONE + erf) / 2n;
}

/** The error of a quantile z for probability p, in z's own relative terms: (Φ(z) − p)/(φ(z)·|z|). */
export function quantileError(z: number, p: number): number {
  const diff = Number(((normalCdfFixed(z) - toFixed(p)) * 10n ** 40n) / ONE) / 1e40;
  const density = Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
  return diff / density / Math.max(Math.abs(z), 1e-300);
}

/** π from the digits above, as a double (for the self-check). */
export const PI_FROM_DIGITS = Number(PI_DIGITS.slice(0, 17)) / 1e16;
