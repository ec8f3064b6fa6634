/** How the pane shows numbers: half-up rounding on the decimal value (src/engine/round.ts). */
import { formatFixed } from '../engine/round';
import type { Figure } from './whatif';

export const DECIMALS = 2;

export function fmt(x: number, decimals = DECIMALS): string {
  return formatFixed(x, decimals);
}

/** A share of the allowance (1 = all of it) as a percent. */
export function pct(share: number, decimals = 0): string {
  return `${formatFixed(share * 100, decimals)} %`;
}

export function showFigure(f: Figure | undefined, as: 'num' | 'pct' = 'num'): string {
  if (!f) return '—';
  if (!f.ok) return '—';
  return as === 'pct' ? pct(f.value) : fmt(f.value);
}

/** Capitalised tier word for labels ("Desirable"). */
export function tierLabel(t: string): string {
  return t === 'fixed' ? 'Fixed limit' : t.charAt(0).toUpperCase() + t.slice(1);
}

/** Today as YYYY-MM-DD in the user's time zone (the provenance date). */
export function today(d = new Date()): string {
  const p = (n: number): string => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}`;
}
