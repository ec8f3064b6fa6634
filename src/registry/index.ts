/**
 * The one function registry: every worksheet function's definition (catalogue/), compiled once.
 * The Excel adapter (src/functions), the CLI (src/cli), the task pane and the generated metadata,
 * help pages and README table all read it. The order here is the catalogue's order.
 */
import { SPEC_FUNCTIONS } from './catalogue/spec';
import { PERF_FUNCTIONS } from './catalogue/perf';
import { BV_FUNCTIONS } from './catalogue/bv';
import { DATA_FUNCTIONS } from './catalogue/data';
import { QC_FUNCTIONS } from './catalogue/qc';
import { VERIFY_FUNCTIONS } from './catalogue/verify';
import { EQA_FUNCTIONS } from './catalogue/eqa';
import { compile, Evaluator } from './evaluate';
import type { FunctionDef } from './define';
import type { Arg, ErrorCell, OutCell, Output } from './types';

export const NAMESPACE = 'LEEWAY';

export const FUNCTIONS: readonly FunctionDef[] = [
  ...SPEC_FUNCTIONS,
  ...PERF_FUNCTIONS,
  ...BV_FUNCTIONS,
  ...DATA_FUNCTIONS,
  ...QC_FUNCTIONS,
  ...VERIFY_FUNCTIONS,
  ...EQA_FUNCTIONS,
];

const BY_NAME = new Map<string, FunctionDef>(FUNCTIONS.map((f) => [f.name, f]));

/** Finds a function by its name, with or without the LEEWAY. prefix, in any case. */
export function findFunction(name: string): FunctionDef | undefined {
  let key = name.trim().toUpperCase();
  if (key.startsWith(NAMESPACE + '.')) key = key.slice(NAMESPACE.length + 1);
  return BY_NAME.get(key);
}

const COMPILED = new Map<string, Evaluator>(FUNCTIONS.map((f) => [f.name, compile(f)]));

/**
 * The compiled evaluator of a function (name with or without the LEEWAY. prefix). With
 * `mapError`, a new evaluator whose error cells are what mapError makes of them (the Excel
 * adapter binds one per function at load time).
 */
export function compiledFunction(name: string, mapError?: (e: ErrorCell) => unknown): Evaluator | undefined {
  if (mapError) {
    const def = findFunction(name);
    return def ? compile(def, mapError) : undefined;
  }
  return COMPILED.get(name) ?? COMPILED.get(findFunction(name)?.name ?? '');
}

const unknown = (name: string): Output => [[{ error: '#VALUE!', message: `unknown function ${name}` }]];

/** Evaluates a registered function; an unknown name is a #VALUE! in the one cell. */
export function evaluate(name: string, args: readonly Arg[]): Output {
  const e = compiledFunction(name);
  return e ? e.run(args) : unknown(name);
}

/**
 * A labelled function's figures, label → cell, in the catalogue's order. When the call fails as a
 * whole (one error cell in place of the spill), every label holds that error.
 */
export function evaluateLabelled(name: string, args: readonly Arg[]): Map<string, OutCell> {
  const def = findFunction(name);
  if (!def || !def.labels) throw new Error(`${name} is not a labelled worksheet function`);
  const out = evaluate(name, args);
  return new Map(def.labels.map((label, k) => [label, out.length >= 2 ? out[1][k] : out[0][0]]));
}

export type { Arg, Output } from './types';
export type { FunctionDef } from './define';
export type { Evaluator } from './evaluate';
