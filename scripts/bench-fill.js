// Benchmark of the table import and the fill (issues 5 and 6). Run: node scripts/bench-fill.js
// Bundles the TypeScript sources in memory with esbuild (nothing written but the workbooks, in a
// temporary folder), then times, as the median of 5 runs after a warm-up (min–max shown):
//   import + validate a 5,000-row CSV (target < 1 s);
//   plan a 1,000-analyte fill (live and values);
//   leeway fill of 1,000 analytes into a new workbook, end to end in-process: read and check the
//   table, plan, write the .xlsx with exceljs, rename into place (target < 3 s);
//   the Excel writer's batch for 10 and 1,000 rows against a recording fake: syncs and ranges.
// Invented data (seeded); not a test: nothing here fails on a slow machine.
'use strict';
const { loadSources } = require('./lib/load-sources');
const path = require('path');
const fs = require('fs');
const os = require('os');

const entry = `
export { parseTableText, acceptImport } from './src/engine/table';
export { planFill } from './src/engine/fill';
export { main } from './src/cli/main';
export { createSheetIO } from './src/taskpane/excel';
export { mulberry32 } from './src/engine/demo/random';
`;
const L = loadSources(entry, 'bench-fill-entry');

function csv(n, seed) {
  const rand = L.mulberry32(seed);
  const lines = ['analyte;specimen;unit;cvi;cvg;source;limit_abs;limit_pct;level;note'];
  for (let i = 0; i < n; i++) {
    const cvi = (0.5 + rand() * 30).toFixed(2).replace('.', ',');
    const cvg = (1 + rand() * 50).toFixed(2).replace('.', ',');
    const lim = i % 5 === 0 ? `${(rand() * 5).toFixed(1).replace('.', ',')};10;${(10 + rand() * 100).toFixed(0)}` : ';;';
    lines.push(`Invented analyte ${i};serum;mmol/L;${cvi};${cvg};"Invented for the benchmark; 2026-01";${lim};${i % 7 === 0 ? 'a note' : ''}`);
  }
  return lines.join('\r\n') + '\r\n';
}

async function time(label, runs, fn) {
  await fn();
  const ms = [];
  for (let i = 0; i < runs; i++) {
    const t0 = process.hrtime.bigint();
    await fn();
    ms.push(Number(process.hrtime.bigint() - t0) / 1e6);
  }
  ms.sort((x, y) => x - y);
  console.log(`${label.padEnd(58)} median ${ms[Math.floor(ms.length / 2)].toFixed(1).padStart(8)} ms  (${ms[0].toFixed(1)}–${ms[ms.length - 1].toFixed(1)})`);
  return ms[Math.floor(ms.length / 2)];
}

(async () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'leeway-bench-'));
  const text5000 = csv(5000, 1);
  console.log(`5,000-row table: ${(text5000.length / 1024).toFixed(0)} KiB`);
  await time('import + validate 5,000 rows (target < 1 s)', 5, () => {
    const r = L.parseTableText(text5000);
    if (!r.ok) throw new Error('bench table has errors');
  });
  const table = L.acceptImport(L.parseTableText(csv(1000, 2), { name: 'bench.csv', origin: 'bench.csv' }));
  for (const mode of ['live', 'values']) {
    await time(`plan a 1,000-analyte fill (${mode})`, 5, () => {
      const r = L.planFill({ table, tier: 'desirable', z: 1.65, mode, target: { kind: 'new-sheet', sheetName: 'S' }, date: '2026-02-03' });
      if (!r.ok) throw new Error('plan failed');
    });
  }
  const file = path.join(dir, 'bench.csv');
  fs.writeFileSync(file, csv(1000, 2));
  const quiet = { out: () => undefined, err: (s) => process.stderr.write(s + '\n') };
  let k = 0;
  for (const live of [false, true]) {
    await time(`leeway fill, 1,000 analytes, new workbook${live ? ', --live' : ''} (target < 3 s)`, 5, async () => {
      const code = await L.main(['fill', '--table', file, '--out', path.join(dir, `o${k++}.xlsx`), ...(live ? ['--live'] : [])], quiet);
      if (code !== 0) throw new Error(`fill exited ${code}`);
    });
  }
  console.log(`output size: ${(fs.statSync(path.join(dir, 'o0.xlsx')).size / 1024).toFixed(0)} KiB`);

  // The Excel writer's batch against a recording fake context.
  for (const n of [10, 1000]) {
    const t = L.acceptImport(L.parseTableText(csv(n, 3)));
    const plan = L.planFill({ table: t, tier: 'desirable', z: 1.65, mode: 'live', target: { kind: 'new-sheet', sheetName: 'S' }, date: '2026-02-03' }).plan;
    let syncs = 0;
    let ranges = 0;
    const range = () => {
      ranges++;
      return { load() {}, formulas: [[]], format: { font: {}, fill: {}, borders: { getItem: () => ({}) } }, dataValidation: { clear() {} } };
    };
    const sheet = { getRange: range, notes: { add() {} }, activate() {} };
    const ctx = { workbook: { worksheets: { add: () => sheet, getItem: () => sheet }, comments: { add() {} } }, application: { suspendApiCalculationUntilNextSync() {} }, sync: async () => void syncs++ };
    const t0 = process.hrtime.bigint();
    await L.createSheetIO((batch) => batch(ctx)).write(plan);
    const ms = Number(process.hrtime.bigint() - t0) / 1e6;
    console.log(`Excel writer, ${String(n).padStart(4)} rows: ${plan.cells.length} cells, ${syncs} syncs, ${ranges} range objects, ${ms.toFixed(1)} ms to build the batch`);
  }
  fs.rmSync(dir, { recursive: true, force: true });
})().catch((e) => {
  console.error(e);
  process.exitCode = 1;
});
