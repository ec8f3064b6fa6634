// Benchmark of the QC design functions (QC.DETECT, QC.FALSEREJECT, QC.PLAN) through the registry,
// as a worksheet or `leeway call` evaluates them. Run: node scripts/bench-qc.js
// Bundles the TypeScript sources in memory with esbuild (nothing written to disk), then times:
//   a multirule QC.DETECT cold (caches emptied) and cached; a whole QC.PLAN cold (all 18
//   candidates, detection and false rejection); 300 QC.PLAN calls for invented analytes (seeded).
// Targets (issue 4): DETECT cold ≤ 20 ms, cached ≤ 0.1 ms; PLAN cold ≤ 250 ms; 300 PLANs in seconds.
'use strict';
const { loadSources } = require('./lib/load-sources');

const entry = `
export { evaluate } from './src/registry';
export { clearQcCaches } from './src/engine/qc/power';
export { planQc, QC_CANDIDATES } from './src/engine/qc/plan';
export { detectionProbability } from './src/engine/qc/power';
export { mulberry32 } from './src/engine/demo/random';
`;
const { evaluate, clearQcCaches, planQc, QC_CANDIDATES, detectionProbability, mulberry32 } = loadSources(entry, 'bench-qc-entry');

const now = () => Number(process.hrtime.bigint()) / 1e6;
function median(xs) {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}
function check(out) {
  if (typeof out[0][0] === 'object') throw new Error(JSON.stringify(out));
  return out;
}

// The very first calls of the process: cold caches and cold (not yet compiled) code, as on
// Excel's first recalculation after loading the add-in.
let t0 = now();
check(evaluate('QC.DETECT', ['1-3s/2-2s/R-4s/4-1s/10-x', 2, 1.5, 5]));
const firstDetect = now() - t0;
t0 = now();
check(evaluate('QC.PLAN', [7, 1, 1.5]));
const firstPlan = now() - t0;

// Warm the JIT on other inputs, so "cold" below means cold caches, not cold code.
for (let i = 0; i < 5; i++) {
  clearQcCaches();
  planQc(8 + i, 1, 2);
}

const rows = [];
const rules = ['1-3s/2-2s/R-4s', '1-3s/2-2s/R-4s/4-1s', '1-3s/2-2s/R-4s/4-1s/10-x'];
for (const rule of rules) {
  for (const [n, runs] of [[2, 1], [4, 1], [2, 5], [4, 3]]) {
    const cold = [];
    const cached = [];
    for (let rep = 0; rep < 9; rep++) {
      clearQcCaches();
      const shift = 1 + rep * 0.173;
      let t = now();
      check(evaluate('QC.DETECT', [rule, n, shift, runs]));
      cold.push(now() - t);
      const reps = 2000;
      t = now();
      for (let k = 0; k < reps; k++) evaluate('QC.DETECT', [rule, n, shift, runs]);
      cached.push((now() - t) / reps);
    }
    rows.push({ what: `QC.DETECT ${rule} n=${n} runs=${runs}`, cold: median(cold), cached: median(cached) });
  }
}

const planCold = [];
for (let rep = 0; rep < 9; rep++) {
  clearQcCaches();
  const t = now();
  check(evaluate('QC.PLAN', [4 + rep * 0.01, 0.5, 2]));
  planCold.push(now() - t);
}
// A PLAN whose target is met nowhere must compute every candidate's detection.
const planAll = [];
for (let rep = 0; rep < 9; rep++) {
  clearQcCaches();
  const t = now();
  check(evaluate('QC.PLAN', [2.9 + rep * 0.01, 0.2, 1]));
  planAll.push(now() - t);
}

// 300 invented analytes (seed 4242): allowable 3–30 %, bias ±2 %, CV 0.5–6 %.
const rand = mulberry32(4242);
const sheet = [];
for (let i = 0; i < 300; i++) sheet.push([3 + 27 * rand(), -2 + 4 * rand(), 0.5 + 5.5 * rand()]);
clearQcCaches();
let t = now();
let unmet = 0;
for (const [allowable, bias, cv] of sheet) {
  const out = check(evaluate('QC.PLAN', [allowable, bias, cv]));
  if (out[1][5] === false) unmet++;
}
const sheetCold = now() - t;
t = now();
for (const [allowable, bias, cv] of sheet) evaluate('QC.PLAN', [allowable, bias, cv]);
const sheetWarm = now() - t;

const pad = (s, w) => String(s).padEnd(w);
console.log(`QC benchmark (node ${process.version}, medians of 9)`);
console.log(`${pad('first QC.DETECT of the process (10-x multirule, n=2, runs=5)', 58)} ${firstDetect.toFixed(1)} ms`);
console.log(`${pad('first QC.PLAN of the process (after that DETECT)', 58)} ${firstPlan.toFixed(1)} ms`);
for (const r of rows) console.log(`${pad(r.what, 58)} cold ${r.cold.toFixed(2).padStart(7)} ms   cached ${r.cached.toFixed(4)} ms`);
console.log(`${pad('QC.PLAN cold (allowable 4, bias 0.5, CV 2: target met early)', 58)} ${median(planCold).toFixed(1)} ms`);
console.log(`${pad('QC.PLAN cold (sigma 2.7: every candidate computed)', 58)} ${median(planAll).toFixed(1)} ms`);
console.log(`${pad(`300 QC.PLAN calls, cold caches (${unmet} not met)`, 58)} ${(sheetCold / 1000).toFixed(2)} s`);
console.log(`${pad('300 QC.PLAN calls again (cached)', 58)} ${sheetWarm.toFixed(1)} ms`);
void QC_CANDIDATES;
void detectionProbability;
