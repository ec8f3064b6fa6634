/**
 * The function metadata Excel reads (functions.json), generated from the wrappers' JSDoc by
 * custom-functions-metadata exactly as the webpack build does, checked against the registry.
 */
import * as fs from 'fs';
import * as path from 'path';
import { generateCustomFunctionsMetadata } from 'custom-functions-metadata';
import { FUNCTIONS, NAMESPACE } from '../../src/registry';

interface MetaParam {
  name: string;
  description?: string;
  optional?: boolean;
  dimensionality?: string;
}
interface MetaFunction {
  id: string;
  name: string;
  description?: string;
  parameters: MetaParam[];
  result: { dimensionality?: string };
}

const dir = path.join(__dirname, '..', '..', 'src', 'functions');
const files = fs
  .readdirSync(dir)
  .filter((f) => f.endsWith('.ts') && f !== 'adapter.ts')
  .map((f) => path.join(dir, f));

let meta: MetaFunction[] = [];
let errors: string[] = [];

beforeAll(async () => {
  const result = await generateCustomFunctionsMetadata(files, true);
  errors = result.errors;
  meta = result.metadataJson ? (JSON.parse(result.metadataJson).functions as MetaFunction[]) : [];
});

describe('generated functions.json', () => {
  test('generates without errors', () => {
    expect(errors).toEqual([]);
  });

  test('every registry function is present exactly once, and nothing else', () => {
    const ids = meta.map((m) => m.id).sort();
    expect(ids).toEqual(FUNCTIONS.map((f) => f.name).sort());
    for (const m of meta) expect(m.name).toBe(m.id);
  });

  test('parameters match the registry: names, order, optional flags; every one a matrix', () => {
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

  test('the manifest registers these functions under the LEEWAY namespace', () => {
    const manifest = fs.readFileSync(path.join(__dirname, '..', '..', 'manifest.xml'), 'utf8');
    expect(manifest).toMatch(new RegExp(`id="Functions.Namespace" DefaultValue="${NAMESPACE}"`));
  });

  test('the built functions.json (when present) is the generated one', () => {
    const built = path.join(__dirname, '..', '..', 'dist', 'addin', 'functions.json');
    if (!fs.existsSync(built)) return;
    const ids = (JSON.parse(fs.readFileSync(built, 'utf8')).functions as MetaFunction[]).map((m) => m.id).sort();
    expect(ids).toEqual(meta.map((m) => m.id).sort());
  });
});
