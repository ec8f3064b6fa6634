/**
 * Parameters shared across families, so each name, default, word table and help text is set once.
 */
import { readTier, DEFAULT_TIER } from '../engine/tiers';
import { Z_TOTAL_ERROR, Z_TWO_SIDED_95 } from '../engine/coverage';
import { num, optNum, optWord } from './define';

export const TIER = optWord('tier', readTier, DEFAULT_TIER, '"optimum", "desirable" (default) or "minimum"; also "opt", "des", "min".');
export const Z_TE = optNum('z', Z_TOTAL_ERROR, 'Coverage factor, default 1.65 (one-sided 95 %); ≥ 0.');
export const Z_95 = optNum('z', Z_TWO_SIDED_95, 'Coverage factor, default 1.96 (two-sided 95 %).');

export const CVI = num('cvi', 'Within-subject biological variation CVI, %.');
export const CVG = num('cvg', 'Between-subject biological variation CVG, %.');
export const CV = num('cv', 'Observed analytical CV, %.');
export const BIAS = num('bias', 'Observed bias, % (signed; its absolute value is used).');
export const ALLOWABLE = num('allowable', 'Allowable total error, %; ≥ 0.');
