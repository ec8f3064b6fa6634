// Benchmark of risk-based QC frequency in the engine (QC.RISK, QC.RUNSIZE, QC.PLAN with its run
// size). Run: node scripts/bench-risk.js
// Bundles the TypeScript sources in memory with esbuild (nothing written to disk), then times:
//   the very first QC.RISK of the process; QC.RISK cold (every QC cache emptied) per rule and n;
//   QC.PLAN cold (with its run size); 300 QC.PLAN calls for invented analytes (seeded), cold and
//   cached. Targets: QC.RISK cold ≤ 100 ms for 1-3s/2-2s/R-4s/4-1s with n = 4; QC.PLAN cold
//   ≤ 300 ms. Timings only: nothing here is a test.
'use strict';
const { loadSources } = require('./lib/load-sources');

const entry = `
export { qcRisk, qcRunSize, clearRiskCaches } from './src/engine/qc/risk';
export { clearQcCaches } from './src/engine/qc/power';
export { planQc, candidateRunSizes } from './src/engine/qc/plan';
export { mulberry32 } from './src/engine/demo/random';
`;
const { qcRisk, qcRunSize, clearRiskCaches, clearQcCaches, planQc, candidateRunSizes, mulberry32 } = loadSources(
  entry,
  'bench-risk-entry',
);

const now = () => Number(process.hrtime.bigint()) / 1e6;
function median(xs) {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}
function cold() {
  clearQcCaches();
  clearRiskCaches();
}

// The very first call of the process: cold caches and cold (not yet compiled) code.
let t0 = now();
qcRisk(6, 1, 1.2, '1-3s/2-2s/R-4s/4-1s', 4, 100);
const first = now() - t0;

// Warm the JIT on other inputs, so "cold" below means cold caches, not cold code.
for (let i = 0; i < 3; i++) {
  cold();
  for (const [rule, n] of [['1-3s', 2], ['1-3s/2-2s/R-4s', 2], ['1-3s/2-2s/R-4s/4-1s/10-x', 4]]) qcRisk(7 + i, 0.5, 1.5, rule, n, 10);
}

const rows = [];
const cases = [
  ['1-3s', 1],
  ['1-2.5s', 4],
  ['1-3s/2-2s/R-4s', 2],
  ['1-3s/2-2s/R-4s', 4],
  ['1-3s/2-2s/R-4s/4-1s', 2],
  ['1-3s/2-2s/R-4s/4-1s', 4],
  ['1-3s/2-2s/R-4s/4-1s/10-x', 2],
  ['1-3s/2-2s/R-4s/4-1s/10-x', 4],
];
for (const [rule, n] of cases) {
  const times = [];
  const cached = [];
  for (let rep = 0; rep < 9; rep++) {
    const sigma = 2.5 + rep * 0.5; // sigma 2.5 … 6.5, bias 1 %, CV 2 %
    cold();
    let t = now();
    qcRisk(1 + 2 * sigma, 1, 2, rule, n, 50);
    times.push(now() - t);
    t = now();
    for (let k = 0; k < 1000; k++) qcRisk(1 + 2 * sigma, 1, 2, rule, n, 50);
    cached.push((now() - t) / 1000);
  }
  rows.push({ what: `QC.RISK ${rule} n=${n}`, cold: median(times), max: Math.max(...times), cached: median(cached) });
}

const plans = [];
for (const [allowable, bias, cv] of [[4, 0.5, 2], [2.9, 0.2, 1], [6, 1, 1.2], [10, 0, 2], [5, 0, 1.1], [3.6, 0.3, 1]]) {
  const times = [];
  for (let rep = 0; rep < 5; rep++) {
    cold();
    const t = now();
    const p = planQc(allowable, bias, cv);
    times.push(now() - t);
    if (rep === 0) plans.push({ allowable, bias, cv, rule: p.rule, n: p.n, runSize: p.runSize });
  }
  plans[plans.length - 1].cold = median(times);
  plans[plans.length - 1].max = Math.max(...times);
}

// Run size of every candidate, as the task pane shows them.
const paneTimes = [];
for (let rep = 0; rep < 5; rep++) {
  cold();
  const t = now();
  candidateRunSizes(6, 1, 1.2);
  paneTimes.push(now() - t);
}

// 300 invented analytes (seed 4242): allowable 3–30 %, bias ±2 %, CV 0.5–6 %.
const rand = mulberry32(4242);
const sheet = [];
for (let i = 0; i < 300; i++) sheet.push([3 + 27 * rand(), -2 + 4 * rand(), 0.5 + 5.5 * rand()]);
cold();
let t = now();
let zero = 0;
for (const [allowable, bias, cv] of sheet) if (planQc(allowable, bias, cv).runSize === 0) zero++;
const sheetCold = now() - t;
t = now();
for (const [allowable, bias, cv] of sheet) planQc(allowable, bias, cv);
const sheetWarm = now() - t;
cold();
t = now();
for (const [allowable, bias, cv] of sheet) qcRunSize(allowable, bias, cv, '1-3s/2-2s/R-4s/4-1s', 4);
const sheetRunSize = now() - t;

const pad = (s, w) => String(s).padEnd(w);
console.log(`Risk-based QC frequency benchmark (node ${process.version}; medians, max of the cold runs)`);
console.log(`${pad('first QC.RISK of the process (1-3s/2-2s/R-4s/4-1s, n=4)', 62)} ${first.toFixed(1)} ms`);
for (const r of rows) {
  console.log(`${pad(r.what, 62)} cold ${r.cold.toFixed(1).padStart(6)} ms (max ${r.max.toFixed(1)})   cached ${r.cached.toFixed(4)} ms`);
}
for (const p of plans) {
  const what = `QC.PLAN cold (${p.allowable}, ${p.bias}, ${p.cv}) → ${p.rule} n=${p.n}, run size ${p.runSize}`;
  console.log(`${pad(what, 62)} ${p.cold.toFixed(1).padStart(6)} ms (max ${p.max.toFixed(1)})`);
}
console.log(`${pad('run size of all 18 candidates, cold (6, 1, 1.2)', 62)} ${median(paneTimes).toFixed(1).padStart(6)} ms`);
console.log(`${pad(`300 QC.PLAN calls with run size, cold caches (${zero} with run size 0)`, 62)} ${(sheetCold / 1000).toFixed(2)} s`);
console.log(`${pad('300 QC.PLAN calls again (cached)', 62)} ${sheetWarm.toFixed(1)} ms`);
console.log(`${pad('300 QC.RUNSIZE 1-3s/2-2s/R-4s/4-1s n=4, cold caches', 62)} ${(sheetRunSize / 1000).toFixed(2)} s`);
