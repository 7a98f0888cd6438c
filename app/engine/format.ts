// Number formatting for readings, limits and messages.

/** Significant figures in a typed number: "1.47" → 3, "1470" → 3, "120.0" → 4, "0.050" → 2. */
export function countSigFigs(text: string): number {
  const mantissa = text.replace(/^[+-]/, "").split(/[eE]/)[0] ?? "";
  const hasPoint = mantissa.includes(".");
  let digits = mantissa.replace(".", "").replace(/^0+/, "");
  if (!hasPoint) digits = digits.replace(/0+$/, "");
  return Math.max(1, digits.length);
}

/** Decimal places a typed number shows: "1.40" → 2, "208" → 0, "1.5e-6" → 0 (exponent form). */
export function countDecimals(text: string): number {
  const mantissa = text.split(/[eE]/)[0] ?? "";
  const i = mantissa.indexOf(".");
  return i < 0 ? 0 : mantissa.length - i - 1;
}

function clampDecimals(d: number): number {
  return Math.min(20, Math.max(0, d));
}

/** x to `sig` significant figures, trailing zeros kept ("1.40"), never in exponent form for everyday magnitudes. */
export function formatSig(x: number, sig: number): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return sig > 1 ? (0).toFixed(Math.min(sig - 1, 3)) : "0";
  const mag = Math.floor(Math.log10(Math.abs(x)));
  if (mag > 15 || mag < -12) return x.toPrecision(sig);
  const decimals = sig - 1 - mag;
  if (decimals >= 0) {
    // toFixed may round up into the next magnitude (9.996 → "10.00"); recompute once if so.
    const s = x.toFixed(clampDecimals(decimals));
    const digits = s.replace(/^-/, "").replace(".", "").replace(/^0+/, "").length;
    if (digits > sig && decimals > 0) return x.toFixed(clampDecimals(decimals - 1));
    return s;
  }
  const f = 10 ** -decimals;
  return String(Math.round(x / f) * f);
}

/** x to at most `maxSig` significant figures with trailing zeros dropped: 1.41, 197.6, 10.91, 114. */
export function formatCompact(x: number, maxSig = 4): string {
  const s = formatSig(x, maxSig);
  if (!s.includes(".") || /e/i.test(s)) return s;
  return s.replace(/0+$/, "").replace(/\.$/, "");
}

/** A number as written in the canonical tree file: shortest exact form. */
export function formatExact(x: number): string {
  return Object.is(x, -0) ? "0" : String(x);
}
