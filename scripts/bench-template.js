#!/usr/bin/env node
// Benchmark of `leeway fill --template` (node scripts/bench-template.js). Each line is one fill
// run in a fresh Node process (the built CLI, dist/cli/leeway.js), as the median of 5 runs after a
// warm-up, with the process's peak resident memory (max RSS, the largest of the runs):
//   the corpus's printable.xlsx (a title, a header, four analytes);
//   stray.xlsx: the same with one value at ZZ200000 (the dimension reaches 140 million cells);
//   a template of 5,000 analytes made here with exceljs (invented names, seeded).
// The node baseline line is a process that loads the CLI and does nothing. Not a test: nothing
// here fails on a slow machine. Invented data.
'use strict';
const path = require('path');
const fs = require('fs');
const os = require('os');
const { execFileSync } = require('child_process');
const root = path.join(__dirname, '..');
const cli = path.join(root, 'dist', 'cli', 'leeway.js');
const fixtures = path.join(root, 'test', 'fixtures', 'templates');
if (!fs.existsSync(cli)) execFileSync(process.execPath, [path.join(root, 'scripts', 'build-cli.js')], { stdio: 'inherit' });

/** One fill in a child process: wall time inside the process and its peak RSS. */
function once(args) {
  const code = `
    const { performance } = require('perf_hooks');
    const { main } = require(${JSON.stringify(cli)});
    const t0 = performance.now();
    main(${JSON.stringify(args)}, { out: () => {}, err: (s) => process.stderr.write(s + '\\n') }).then((rc) => {
      const ms = performance.now() - t0;
      process.stdout.write(JSON.stringify({ rc, ms, rss: process.resourceUsage().maxRSS }));
    });`;
  return JSON.parse(execFileSync(process.execPath, ['-e', code], { encoding: 'utf8', cwd: root }));
}

function bench(label, args, runs = 5) {
  once(args);
  const ms = [];
  let rss = 0;
  for (let i = 0; i < runs; i++) {
    const r = once(args);
    if (args.length && r.rc !== 0) throw new Error(`${label}: exit ${r.rc}`);
    ms.push(r.ms);
    rss = Math.max(rss, r.rss);
  }
  ms.sort((a, b) => a - b);
  console.log(`${label.padEnd(52)} median ${ms[Math.floor(runs / 2)].toFixed(1).padStart(7)} ms (${ms[0].toFixed(1)}–${ms[runs - 1].toFixed(1)})  max RSS ${(rss / 1024).toFixed(0).padStart(4)} MiB`);
}

async function bigTemplate(file, n) {
  const ExcelJS = require('exceljs');
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Specifications');
  ws.addRow(['Analyte', 'Specimen', 'CVI %', 'CVG %', 'Allowable CV %', 'Allowable bias %', 'Allowable total error %']);
  for (let i = 0; i < n; i++) ws.addRow([`Invented analyte ${i}`, 'Serum']);
  await wb.xlsx.writeFile(file);
}

function table(file, n) {
  let seed = 20260203;
  const rand = () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const lines = ['analyte,specimen,unit,cvi,cvg,source'];
  for (let i = 0; i < n; i++) lines.push(`Invented analyte ${i},Serum,mmol/L,${(0.5 + rand() * 30).toFixed(2)},${(1 + rand() * 50).toFixed(2)},Invented for the benchmark (2026-01)`);
  fs.writeFileSync(file, lines.join('\r\n') + '\r\n');
}

(async () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'leeway-bench-template-'));
  const out = path.join(dir, 'out.xlsx');
  const t4 = path.join(fixtures, 'table.csv');
  bench('node, the CLI loaded, no fill (baseline)', []);
  bench('printable.xlsx, 4 analytes', ['fill', '--table', t4, '--template', path.join(fixtures, 'printable.xlsx'), '--out', out, '--force']);
  bench('stray.xlsx, the same with a value at ZZ200000', ['fill', '--table', t4, '--template', path.join(fixtures, 'stray.xlsx'), '--out', out, '--force']);
  const big = path.join(dir, 'big.xlsx');
  const bigTable = path.join(dir, 'big.csv');
  await bigTemplate(big, 5000);
  table(bigTable, 5000);
  bench('a 5,000-analyte template, 5,000-row table', ['fill', '--table', bigTable, '--template', big, '--out', out, '--force']);
  fs.rmSync(dir, { recursive: true, force: true });
})().catch((e) => {
  console.error(e);
  process.exitCode = 1;
});
