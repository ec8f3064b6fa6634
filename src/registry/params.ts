/**
 * Parameter definitions shared across families, so each name, default and word table is set once.
 */
import { readTier, DEFAULT_TIER } from '../engine/tiers';
import { Z_TOTAL_ERROR, Z_TWO_SIDED_95 } from '../engine/coverage';
import type { ParamDef } from './types';

export const num = (name: string): ParamDef => ({ name, type: 'number' });

export const optNum = (name: string, dflt: number | undefined): ParamDef => ({
  name,
  type: 'number',
  optional: true,
  default: dflt,
  coercedDefault: dflt,
});

export const range = (name: string, optional = false): ParamDef => ({ name, type: 'range', optional });

export const word = <W>(name: string, read: (t: string) => W, dflt?: string): ParamDef<W> => ({
  name,
  type: 'word',
  read,
  optional: dflt !== undefined,
  default: dflt,
  coercedDefault: dflt === undefined ? undefined : read(dflt),
});

export const TIER: ParamDef = word('tier', readTier, DEFAULT_TIER);
export const Z_TE: ParamDef = optNum('z', Z_TOTAL_ERROR);
export const Z_95: ParamDef = optNum('z', Z_TWO_SIDED_95);
