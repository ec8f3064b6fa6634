// Benchmark of the review of control results (the engine of QC.FLAGS and QC.REVIEW).
// Run: node scripts/bench-flags.js
// Bundles the TypeScript sources in memory with esbuild (nothing written to disk), then times
// the flags of 10,000 invented control results (seeded: two materials, two per run, labelled
// runs) under the five-term multirule, and the review of the same series.
// Target: flags of 10,000 results well under 20 ms (the work is linear in results × terms).
// Times on a shared machine jump with other processes and garbage collection: the table gives
// the first call (cold code), then, after warming the JIT on another series, the median and the
// fastest of 31 calls.
'use strict';
const { loadSources } = require('./lib/load-sources');

const entry = `
export { controlFlags } from './src/engine/qc/flags';
export { controlReview } from './src/engine/qc/review';
export { parseRule } from './src/engine/qc/rules';
export { mulberry32, normalDeviates } from './src/engine/demo/random';
`;
const { controlFlags, controlReview, parseRule, mulberry32, normalDeviates } = loadSources(entry, 'bench-flags-entry');

const now = () => Number(process.hrtime.bigint()) / 1e6;
function median(xs) {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

function invented(n, seed) {
  const g = normalDeviates(mulberry32(seed));
  const values = [];
  const target = [];
  const sd = [];
  const runs = [];
  const levels = [];
  for (let i = 0; i < n; i++) {
    const high = i % 2 === 1;
    const t = high ? 250 : 80;
    const s = high ? 6 : 2.5;
    values.push(t + s * g());
    target.push(t);
    sd.push(s);
    runs.push(`run ${Math.floor(i / 2) + 1}`);
    levels.push(high ? 'High' : 'Low');
  }
  return { values, target, sd, runs, levels };
}

const rule = parseRule('1-3s/2-2s/R-4s/4-1s/10-x');
const rows = [];
for (const n of [1000, 10000, 100000]) {
  const data = { ...invented(n, 20260101 + n), rule };
  const first = now();
  controlFlags(data);
  const cold = now() - first;
  const warm = { ...invented(n, 7 + n), rule };
  for (let rep = 0; rep < 20; rep++) controlReview(warm);
  const times = [];
  const review = [];
  for (let rep = 0; rep < 31; rep++) {
    let t = now();
    controlFlags(data);
    times.push(now() - t);
    t = now();
    controlReview(data);
    review.push(now() - t);
  }
  rows.push({
    results: n,
    'flags first call ms': cold.toFixed(2),
    'flags median ms': median(times).toFixed(2),
    'flags fastest ms': Math.min(...times).toFixed(2),
    'review median ms': median(review).toFixed(2),
  });
}
console.table(rows);
const at10k = Number(rows[1]['flags median ms']);
console.log(`10,000 results, five-term rule, median: ${at10k.toFixed(2)} ms (target well under 20 ms): ${at10k < 20 ? 'met' : 'NOT met'}`);
