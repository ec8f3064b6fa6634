/**
 * The one function registry: every worksheet function's name, parameters and engine call.
 * The Excel wrappers (src/functions) and the CLI (src/cli) both evaluate through `evaluate`.
 * Each family adds its table in catalogue/; the order here is the catalogue order of SPEC.md.
 */
import { SPEC_FUNCTIONS } from './catalogue/spec';
import { PERF_FUNCTIONS } from './catalogue/perf';
import { BV_FUNCTIONS } from './catalogue/bv';
import { DATA_FUNCTIONS } from './catalogue/data';
import { QC_FUNCTIONS } from './catalogue/qc';
import { evaluateDef } from './evaluate';
import type { Arg, FunctionDef, Output } from './types';

export const NAMESPACE = 'LEEWAY';

export const FUNCTIONS: readonly FunctionDef[] = [
  ...SPEC_FUNCTIONS,
  ...PERF_FUNCTIONS,
  ...BV_FUNCTIONS,
  ...DATA_FUNCTIONS,
  ...QC_FUNCTIONS,
];

const BY_NAME = new Map<string, FunctionDef>(FUNCTIONS.map((f) => [f.name, f]));

/** Finds a function by its name, with or without the LEEWAY. prefix, in any case. */
export function findFunction(name: string): FunctionDef | undefined {
  let key = name.trim().toUpperCase();
  if (key.startsWith(NAMESPACE + '.')) key = key.slice(NAMESPACE.length + 1);
  return BY_NAME.get(key);
}

/** Evaluates a registered function; an unknown name is a #NAME?-like #VALUE! in the one cell. */
export function evaluate(name: string, args: readonly Arg[]): Output {
  const def = BY_NAME.get(name) ?? findFunction(name);
  if (!def) return [[{ error: '#VALUE!', message: `unknown function ${name}` }]];
  return evaluateDef(def, args);
}

export type { Arg, FunctionDef, Output } from './types';
