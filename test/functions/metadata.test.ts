/**
 * The function metadata Excel reads (functions.json), generated from the function catalogue, and
 * the custom-functions entry that associates each id with its evaluator: both come from the same
 * definitions, so they cannot disagree. The built file is the generated one.
 */
import * as fs from 'fs';
import * as path from 'path';
import { FUNCTIONS, NAMESPACE } from '../../src/registry';
import { functionsJson, helpPage, helpPath } from '../../src/registry/metadata';

const root = path.join(__dirname, '..', '..');
const origin = 'https://localhost:3000';
const meta = functionsJson(origin).functions;

/**
 * Ids Excel has seen: a saved workbook refers to a function by its id, so an id once published
 * never changes. New functions add to this list; none is ever removed or renamed.
 */
const PUBLISHED_IDS = [
  'SPEC.CV', 'SPEC.BIAS', 'SPEC.TOTAL', 'SPEC.MU', 'SPEC.FIXED', 'SPEC.TIERS', 'ZSCORE',
  'PERF.TOTAL', 'PERF.SIGMA', 'PERF.SHARE', 'PERF.TIER', 'QC.SHIFT',
  'BV.RCV', 'BV.RCVLOG', 'BV.INDIVIDUALITY', 'BV.SETPOINT',
  'DATA.CV', 'DATA.BIAS', 'DATA.RMSBIAS', 'DATA.PRECISION', 'DATA.COMPARE', 'MU.BIAS', 'MU.COMBINE',
  'QC.DETECT', 'QC.FALSEREJECT', 'QC.PLAN',
];

describe('generated functions.json', () => {
  test('every catalogue function is present exactly once, and nothing else', () => {
    const ids = meta.map((m) => m.id).sort();
    expect(ids).toEqual(FUNCTIONS.map((f) => f.name).sort());
    expect(new Set(ids).size).toBe(ids.length);
    for (const m of meta) expect(m.name).toBe(m.id);
  });

  test('no published id has gone or changed', () => {
    const ids = new Set(meta.map((m) => m.id));
    for (const id of PUBLISHED_IDS) expect([id, ids.has(id)]).toEqual([id, true]);
  });

  test('ids hold only letters, digits and periods (the Office metadata rule)', () => {
    for (const m of meta) expect(m.id).toMatch(/^[A-Z0-9.]+$/);
  });

  test('parameters match the catalogue: names, order, optional flags; every one a matrix', () => {
    for (const f of FUNCTIONS) {
      const m = meta.find((x) => x.id === f.name);
      expect(m).toBeDefined();
      expect(m!.parameters.map((p) => p.name)).toEqual(f.params.map((p) => p.name));
      expect(m!.parameters.map((p) => !!p.optional)).toEqual(f.params.map((p) => !!p.optional));
      for (const p of m!.parameters) expect(p.dimensionality).toBe('matrix');
      expect(m!.result.dimensionality).toBe('matrix');
    }
  });

  test('each function and each parameter has a description; help names units or a source', () => {
    for (const m of meta) {
      expect((m.description ?? '').length).toBeGreaterThan(40);
      for (const p of m.parameters) expect((p.description ?? '').length).toBeGreaterThan(5);
    }
  });

  test('each function\'s help names its source: a publication year, a standard, or "common practice"', () => {
    for (const m of meta) expect([m.id, /\b(19|20)\d\d\b|common practice|Nordtest|ISO|CLSI/i.test(m.description ?? '')]).toEqual([m.id, true]);
  });

  test('the optional parameters state their default in the help', () => {
    for (const f of FUNCTIONS) {
      const m = meta.find((x) => x.id === f.name)!;
      f.params.forEach((p, i) => {
        if (p.optional && p.default !== undefined) {
          expect(m.parameters[i].description).toMatch(new RegExp(`default|${String(p.default)}`, 'i'));
        }
      });
    }
  });

  test('each function links to its own help page on the add-in\'s origin', () => {
    for (const f of FUNCTIONS) {
      const m = meta.find((x) => x.id === f.name)!;
      expect(m.helpUrl).toBe(`${origin}/${helpPath(f)}`);
      const page = helpPage(f);
      expect(page).toContain(`${NAMESPACE}.${f.name}`);
      for (const p of f.params) expect(page).toContain(`<code>${p.name}</code>`);
    }
  });

  test('the manifest registers these functions under the LEEWAY namespace', () => {
    const manifest = fs.readFileSync(path.join(root, 'manifest.xml'), 'utf8');
    expect(manifest).toMatch(new RegExp(`id="Functions.Namespace" DefaultValue="${NAMESPACE}"`));
  });

  test('the built add-in serves the generated functions.json and a help page per function (npm test builds first)', () => {
    const dist = path.join(root, 'dist', 'addin');
    expect([dist, fs.existsSync(path.join(dist, 'functions.json'))]).toEqual([dist, true]);
    const built = JSON.parse(fs.readFileSync(path.join(dist, 'functions.json'), 'utf8'));
    expect(built).toEqual(JSON.parse(JSON.stringify(functionsJson(origin))));
    for (const f of FUNCTIONS) expect([f.name, fs.existsSync(path.join(dist, helpPath(f)))]).toEqual([f.name, true]);
  });
});

describe('the custom-functions entry', () => {
  test('associates every catalogue id with a function taking one argument per parameter', async () => {
    const associated = new Map<string, (...a: unknown[]) => unknown>();
    (globalThis as unknown as { CustomFunctions: unknown }).CustomFunctions = {
      associate: (id: string, fn: (...a: unknown[]) => unknown) => associated.set(id, fn),
      Error: class {
        constructor(
          public code: string,
          public message?: string,
        ) {}
      },
      ErrorCode: { invalidValue: '#VALUE!', notAvailable: '#N/A', divisionByZero: '#DIV/0!', invalidNumber: '#NUM!' },
    };
    await import('../../src/functions/index');
    expect([...associated.keys()].sort()).toEqual(meta.map((m) => m.id).sort());
    for (const f of FUNCTIONS) expect([f.name, associated.get(f.name)!.length]).toEqual([f.name, f.params.length]);
    // An invocation object after the arguments (as the runtime may pass) is not read as an argument.
    expect(associated.get('SPEC.CV')!([[5.7]], null, { address: 'A1' })).toEqual([[2.85]]);
  });
});
