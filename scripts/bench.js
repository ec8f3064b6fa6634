#!/usr/bin/env node
// npm run bench [-- --json]: Leeway's benchmark. Every ratio is A/B measured in the same run on
// the same machine; every timing is the median of several runs after a warm-up, printed with its
// spread (min–max). Not a test: nothing here fails on a slow machine.
'use strict';
const path = require('path');
const fs = require('fs');
const zlib = require('zlib');
const Module = require('module');
const { performance } = require('perf_hooks');
const root = path.join(__dirname, '..');
const json = process.argv.includes('--json');

// Bundle the TypeScript sources the benchmark needs in memory (nothing written to disk).
const entry = `
export { evaluate } from './src/registry';
export { allowableTotalError } from './src/engine/spec';
export { specTotal } from './src/functions/spec';
export { leewaySheet } from './test/support/hyperformula';
export * as qcPower from './src/engine/qc/power';
`;
const built = require('esbuild').buildSync({
  stdin: { contents: entry, resolveDir: root, loader: 'ts', sourcefile: 'bench-entry.ts' },
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  write: false,
  external: ['exceljs', 'papaparse', 'decimal.js', 'hyperformula'],
  logLevel: 'error',
});
const m = new Module(path.join(root, 'bench-entry.js'));
m.paths = Module._nodeModulePaths(root);
m._compile(built.outputFiles[0].text, path.join(root, 'bench-entry.js'));
const L = m.exports;

// The worksheet wrappers need Excel's CustomFunctions global; a minimal stand-in.
globalThis.CustomFunctions = {
  Error: class {
    constructor(code, message) {
      this.code = code;
      this.message = message;
    }
  },
  ErrorCode: { invalidValue: '#VALUE!', notAvailable: '#N/A', divisionByZero: '#DIV/0!', invalidNumber: '#NUM!' },
};

function measure(fn, { runs = 7, warmup = 2 } = {}) {
  for (let i = 0; i < warmup; i++) fn();
  const t = [];
  for (let i = 0; i < runs; i++) {
    const a = performance.now();
    fn();
    t.push(performance.now() - a);
  }
  t.sort((x, y) => x - y);
  return { median: t[Math.floor(t.length / 2)], min: t[0], max: t[t.length - 1] };
}

function seeded(seed) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const rows = [];
const out = {};
function record(key, label, value, spread, target, unit = '') {
  out[key] = Number(value.toPrecision(4));
  rows.push({ key, label, value, spread, target, unit });
}
function ratio(key, label, a, b, target) {
  const r = a.median / b.median;
  record(key, label, r, `${a.median.toFixed(2)} ms / ${b.median.toFixed(2)} ms (A ${a.min.toFixed(2)}–${a.max.toFixed(2)}, B ${b.min.toFixed(2)}–${b.max.toFixed(2)})`, target);
}
function timing(key, label, t, target) {
  record(key, label, t.median, `${t.min.toFixed(3)}–${t.max.toFixed(3)} ms`, target, ' ms');
}

// --- sheet_ratio: 10,000 rows of LEEWAY.SPEC.TOTAL vs the hand-typed native formula in HyperFormula
{
  const rand = seeded(1);
  const data = [];
  for (let i = 0; i < 10000; i++) data.push([1 + 20 * rand(), 1 + 40 * rand()]);
  const sheet = (formula) => data.map((r, i) => [r[0], r[1], formula(i + 1)]);
  const hfLeeway = L.leewaySheet({ S: sheet((r) => `=LEEWAY.SPEC.TOTAL(A${r},B${r})`) });
  const hfNative = L.leewaySheet({ S: sheet((r) => `=1.65*0.5*A${r}+0.25*SQRT(A${r}^2+B${r}^2)`) });
  const check = hfLeeway.getCellValue({ sheet: 0, row: 9, col: 2 }) - hfNative.getCellValue({ sheet: 0, row: 9, col: 2 });
  if (Math.abs(check) > 1e-12) throw new Error('the two sheets disagree');
  const a = measure(() => hfLeeway.rebuildAndRecalculate(), { runs: 5, warmup: 1 });
  const b = measure(() => hfNative.rebuildAndRecalculate(), { runs: 5, warmup: 1 });
  ratio('sheet_ratio', 'sheet recalc, 10,000 rows: LEEWAY.SPEC.TOTAL / native formula (HyperFormula)', a, b, '≤ 1.5');
}

// --- engine_ratio: the engine's SPEC.TOTAL over 10^6 inputs vs the inline arithmetic
const N = 1e6;
const cvi = new Float64Array(N);
const cvg = new Float64Array(N);
{
  const rand = seeded(2);
  for (let i = 0; i < N; i++) {
    cvi[i] = 0.5 + 30 * rand();
    cvg[i] = 0.5 + 50 * rand();
  }
  let sink = 0;
  const engine = measure(() => {
    for (let i = 0; i < N; i++) sink += L.allowableTotalError(cvi[i], cvg[i], 'desirable', 1.65);
  });
  const inline = measure(() => {
    for (let i = 0; i < N; i++) sink += 1.65 * 0.5 * cvi[i] + 0.25 * Math.sqrt(cvi[i] * cvi[i] + cvg[i] * cvg[i]);
  });
  if (!Number.isFinite(sink)) throw new Error('sink');
  ratio('engine_ratio', 'engine SPEC.TOTAL / inline arithmetic, 10^6 inputs', engine, inline, '≤ 3');
}

// --- wrapper_ratio: the worksheet wrapper (coercion, defaults, error checks) over the engine call,
// one cell per call as Excel calls it for =LEEWAY.SPEC.TOTAL(A2,B2) in each row.
{
  const M = 2e5;
  let sink = 0;
  const cells = [];
  for (let i = 0; i < M; i++) cells.push([[[cvi[i]]], [[cvg[i]]]]);
  const wrapper = measure(() => {
    for (let i = 0; i < M; i++) sink += L.specTotal(cells[i][0], cells[i][1], null, null)[0][0];
  });
  const engine = measure(() => {
    for (let i = 0; i < M; i++) sink += L.allowableTotalError(cells[i][0][0][0], cells[i][1][0][0], 'desirable', 1.65);
  });
  if (!Number.isFinite(sink)) throw new Error('sink');
  ratio('wrapper_ratio', 'worksheet wrapper / engine call, one cell per call', wrapper, engine, '≤ 2');
  const column = cvi.subarray(0, M);
  const colGrid = Array.from(column, (v) => [v]);
  const colGrid2 = Array.from(cvg.subarray(0, M), (v) => [v]);
  const wrapRange = measure(() => {
    sink += L.specTotal(colGrid, colGrid2, null, null).length;
  });
  const engRange = measure(() => {
    for (let i = 0; i < M; i++) sink += L.allowableTotalError(colGrid[i][0], colGrid2[i][0], 'desirable', 1.65);
  });
  ratio('wrapper_range_ratio', 'worksheet wrapper / engine, one 200,000-row range per call', wrapRange, engRange, '(info)');
}

// --- bundle sizes (minified, without office.js)
{
  const dist = path.join(root, 'dist', 'addin');
  const kb = (f) => (fs.existsSync(path.join(dist, f)) ? fs.statSync(path.join(dist, f)).size / 1024 : NaN);
  const gz = (f) => (fs.existsSync(path.join(dist, f)) ? zlib.gzipSync(fs.readFileSync(path.join(dist, f))).length / 1024 : NaN);
  record('functions_kb', 'functions.js, minified (gzip ' + gz('functions.js').toFixed(1) + ' KB)', kb('functions.js'), 'npm run build first', '≤ 80', ' KB');
  record('taskpane_kb', 'taskpane.js, minified (gzip ' + gz('taskpane.js').toFixed(1) + ' KB)', kb('taskpane.js'), 'npm run build first', '≤ 300', ' KB');
}

if (json) {
  process.stdout.write(JSON.stringify(out) + '\n');
} else {
  const w = Math.max(...rows.map((r) => r.label.length));
  console.log(`Leeway benchmark (${new Date().toISOString()}, node ${process.version}, ${require('os').cpus().length} cores)\n`);
  for (const r of rows) {
    console.log(`${r.label.padEnd(w)}  ${r.key.padEnd(20)} ${(r.value.toPrecision(4) + r.unit).padStart(10)}  target ${String(r.target).padEnd(7)} ${r.spread}`);
  }
}
