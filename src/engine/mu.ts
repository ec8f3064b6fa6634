/**
 * Measurement uncertainty from the laboratory's own IQC and EQA/CRM data (MU family), the
 * approach of Magnusson B et al., Nordtest Report TR 537, ed. 4 (2017) (cited from memory; the
 * handbook itself was not at hand, its worked examples are checked second-hand in the tests):
 * the within-laboratory reproducibility u(Rw) (from long-term IQC) and the uncertainty of the
 * method and laboratory bias u(bias) (from EQA rounds or a reference material) are combined as
 * u_c = √(u(Rw)² + u(bias)²), expanded with a coverage factor k (2 for about 95 %).
 *
 * Units: whatever single unit the caller is consistent in; usually percent (relative
 * uncertainties), so 1.67 means 1.67 %.
 */
import { numError } from './errors';
import { fits, nonNegative, positive } from './guards';
import { rootMeanSquareScaled } from './data/describe';
import { hypotenuse, inBand, scaled, times, toDouble } from './scaled';

/**
 * MU.BIAS: u(bias) = √(RMS(bias)² + u(Cref)²), RMS(bias) = √((1/n)·Σ biasᵢ²) over the n biases
 * found (EQA rounds, or one CRM), u(Cref) the standard uncertainty of the assigned or certified
 * values (Nordtest TR 537, bias from PT/EQA or CRM results). Biases signed; u(Cref) ≥ 0;
 * at least one bias. The squares are taken on scaled numbers (no overflow or underflow); a
 * result beyond 1.8e308 is #NUM!.
 */
export function biasUncertainty(biases: ArrayLike<number>, uRef: number): number {
  if (biases.length === 0) throw numError('bias_values holds no numbers: enter at least one bias');
  nonNegative(uRef, 'u_ref');
  const u = toDouble(hypotenuse(rootMeanSquareScaled(biases), scaled(uRef)));
  if (u === Infinity) {
    let top = 0;
    for (let i = 0; i < biases.length; i++) top = Math.max(top, Math.abs(biases[i]));
    fits(u, { 'the largest bias': top, u_ref: uRef });
  }
  return u;
}

/**
 * MU.COMBINE: k·√(u(Rw)² + u(bias)²) (Nordtest TR 537): the combined standard uncertainty for
 * k = 1, the expanded uncertainty for k = 2 (default at the worksheet, about 95 % coverage).
 * u(Rw), u(bias) ≥ 0; k > 0. Taken on scaled numbers; a result beyond 1.8e308 is #NUM!.
 */
export function combinedUncertainty(uRw: number, uBias: number, k: number): number {
  nonNegative(uRw, 'u_rw');
  nonNegative(uBias, 'u_bias');
  positive(k, 'k');
  if (inBand(uRw) && inBand(uBias) && inBand(k)) return k * Math.hypot(uRw, uBias);
  return fits(toDouble(times(scaled(k), hypotenuse(scaled(uRw), scaled(uBias)))), { u_rw: uRw, u_bias: uBias, k });
}
