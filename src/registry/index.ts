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
import { compile, Evaluator } from './evaluate';
import type { Arg, ErrorCell, FunctionDef, Output } from './types';

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
const COMPILED = new Map<string, Evaluator>(FUNCTIONS.map((f) => [f.name, compile(f)]));

/**
 * The compiled evaluator of a function (name with or without the LEEWAY. prefix). With
 * `mapError`, a new evaluator whose error cells are what mapError makes of them (the Excel
 * wrappers bind one each at load time).
 */
export function compiledFunction(name: string, mapError?: (e: ErrorCell) => unknown): Evaluator | undefined {
  if (mapError) {
    const def = findFunction(name);
    return def ? compile(def, mapError) : undefined;
  }
  return COMPILED.get(name) ?? COMPILED.get(findFunction(name)?.name ?? '');
}

const unknown = (name: string): Output => [[{ error: '#VALUE!', message: `unknown function ${name}` }]];

export function evaluate(name: string, args: readonly Arg[]): Output {
  const e = compiledFunction(name);
  return e ? e.run(args) : unknown(name);
}

/**
 * The same, with up to four arguments given positionally and any further ones in `rest` (the
 * worksheet wrappers call this: it spares an argument array per cell).
 */
export function evaluateAt(name: string, a0?: Arg, a1?: Arg, a2?: Arg, a3?: Arg, rest?: readonly Arg[]): Output {
  const e = compiledFunction(name);
  return e ? e.at(a0, a1, a2, a3, rest) : unknown(name);
}

export type { Arg, FunctionDef, Output } from './types';
export type { Evaluator } from './evaluate';
