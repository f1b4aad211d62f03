/**
 * 8-byte reals of the GDSII Stream Format Manual (release 6.0): sign bit, 7-bit exponent in
 * excess 64 of base 16, 56-bit fraction. value = (-1)^s × fraction/2^56 × 16^(exponent-64).
 */
const TWO_32 = 4294967296;

export function readReal8(view: DataView, offset: number): number {
  const hi = view.getUint32(offset);
  const lo = view.getUint32(offset + 4);
  const exponent = (hi >>> 24) & 0x7f;
  const mantissa = (hi & 0x00ffffff) * TWO_32 + lo;
  if (mantissa === 0) return 0;
  const value = mantissa * Math.pow(2, 4 * (exponent - 64) - 56);
  return hi & 0x80000000 ? -value : value;
}

/**
 * Encodes from the number's shortest decimal form and truncates the fraction, which is how the
 * manual's own check value comes out (1e-3 → 3E 41 89 37 4B C6 A7 EF). When that truncation would not
 * decode to the same double, the double's own exact fraction is written instead, so reals always round-trip.
 */
export function encodeReal8(value: number, out: Uint8Array = new Uint8Array(8), at = 0): Uint8Array {
  if (!Number.isFinite(value)) throw new RangeError(`a GDSII real cannot hold ${value}`);
  out.fill(0, at, at + 8);
  if (value === 0) return out;
  const negative = value < 0;
  const { digits, exp10 } = decimalOf(Math.abs(value));
  // |value| = digits × 10^exp10 exactly; find exponent e with 16^(e-65) <= |value| < 16^(e-64).
  let e = Math.floor(Math.log(Math.abs(value)) / Math.log(16)) + 65;
  let mantissa = 0n;
  for (let attempt = 0; attempt < 3; attempt++) {
    mantissa = scaledFloor(digits, exp10, 56 - 4 * (e - 64));
    if (mantissa >= 1n << 56n) e += 1;
    else if (mantissa < 1n << 52n) e -= 1;
    else break;
  }
  if (e < 0 || e > 127) throw new RangeError(`${value} is outside the range of a GDSII real`);
  if (decoded(mantissa, e) !== Math.abs(value)) {
    // A double scaled into [2^52, 2^56) is an integer, so this fraction is exact.
    mantissa = BigInt(Math.abs(value) * Math.pow(2, 56 - 4 * (e - 64)));
  }
  out[at] = (negative ? 0x80 : 0) | e;
  for (let i = 7; i >= 1; i--) {
    out[at + i] = Number(mantissa & 0xffn);
    mantissa >>= 8n;
  }
  return out;
}

function decoded(mantissa: bigint, e: number): number {
  return Number(mantissa) * Math.pow(2, 4 * (e - 64) - 56);
}

function decimalOf(x: number): { digits: bigint; exp10: number } {
  const [mant, expPart] = x.toExponential().split("e");
  const [intPart, frac = ""] = mant.split(".");
  return { digits: BigInt(intPart + frac), exp10: Number(expPart) - frac.length };
}

/** floor(digits × 10^exp10 × 2^shift), exactly. */
function scaledFloor(digits: bigint, exp10: number, shift: number): bigint {
  let num = digits;
  let den = 1n;
  if (exp10 >= 0) num *= 10n ** BigInt(exp10);
  else den *= 10n ** BigInt(-exp10);
  if (shift >= 0) num <<= BigInt(shift);
  else den <<= BigInt(-shift);
  return num / den;
}
