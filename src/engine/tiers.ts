/**
 * The three published tiers of analytical performance specifications from biological variation.
 *
 * Imprecision factor f (CV_A ≤ f·CVI): 0.25 / 0.50 / 0.75; bias factor g
 * (|B| ≤ g·√(CVI² + CVG²)): 0.125 / 0.25 / 0.375; optimum / desirable / minimum.
 * Sources: desirable imprecision, Cotlove E, Harris EK, Williams GZ, Clin Chem 1970;16:1028–32;
 * desirable bias, Gowans EM, Hyltoft Petersen P, Blaabjerg O, Hørder M, Scand J Clin Lab Invest
 * 1988;48:757–64; the optimum and minimum tiers, Fraser CG, Hyltoft Petersen P, Libeer JC,
 * Ricós C, Ann Clin Biochem 1997;34:8–12.
 */
import { makeWordReader } from './words';

export type Tier = 'optimum' | 'desirable' | 'minimum';

/** Most stringent first. */
export const TIERS: readonly Tier[] = ['optimum', 'desirable', 'minimum'];

export const DEFAULT_TIER: Tier = 'desirable';

export const IMPRECISION_FACTOR: Readonly<Record<Tier, number>> = { optimum: 0.25, desirable: 0.5, minimum: 0.75 };

export const BIAS_FACTOR: Readonly<Record<Tier, number>> = { optimum: 0.125, desirable: 0.25, minimum: 0.375 };

/** Reads a tier word: "optimum"/"opt", "desirable"/"des", "minimum"/"min", any case, spaces trimmed. */
export const readTier = makeWordReader<Tier>('tier', {
  optimum: ['opt'],
  desirable: ['des'],
  minimum: ['min'],
});
