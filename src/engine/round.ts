/**
 * Display rounding: half-up (away from zero on a tie) to a number of decimals, on the decimal
 * value the user sees, not on the binary double (so 2.675 → 2.68, not 2.67). Results keep full
 * precision everywhere else; only the task pane, the CLI's tables and filled sheets' shown text
 * use this. One numeric context, set here and nowhere else.
 */
import Decimal from 'decimal.js';

const D = Decimal.clone({ precision: 40, rounding: Decimal.ROUND_HALF_UP });

export function roundHalfUp(x: number, decimals: number): number {
  if (!Number.isFinite(x)) return x;
  return new D(String(x)).toDecimalPlaces(decimals, D.ROUND_HALF_UP).toNumber();
}

export function formatFixed(x: number, decimals: number): string {
  if (!Number.isFinite(x)) return String(x);
  return new D(String(x)).toFixed(decimals, D.ROUND_HALF_UP);
}
