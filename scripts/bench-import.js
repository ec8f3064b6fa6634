#!/usr/bin/env node
// Benchmark of reading big lab files with `leeway check` (the built command, dist/cli/leeway.js;
// run `npm run build:cli` first). Run: node scripts/bench-import.js [--mb 100]
// Generates into a temporary folder (removed afterwards):
//   wide.csv  — about 100 MB (decimal megabytes, under the 100 MiB limit): a 3-column table whose
//               every line ends in 5,000 empty columns (a spreadsheet saving a wide empty range);
//   long.csv  — about 100 MB of an ordinary 7-column table;
//   over.csv  — a sparse file one byte over the limit (refused before reading).
// For each it prints the wall time and the child process's peak resident memory (maxRSS), as the
// median of 3 runs (min–max). Not a test: nothing here fails on a slow machine.
'use strict';
const { spawnSync } = require('child_process');
const fs = require('fs');
const os = require('os');
const path = require('path');

const root = path.join(__dirname, '..');
const bundle = path.join(root, 'dist', 'cli', 'leeway.js');
if (!fs.existsSync(bundle)) {
  console.error('dist/cli/leeway.js is missing: run npm run build:cli first');
  process.exit(2);
}
const mbArg = process.argv.indexOf('--mb');
const targetBytes = (mbArg > 0 ? Number(process.argv[mbArg + 1]) : 100) * 1e6;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'leeway-bench-import-'));

function writeLines(file, header, line, target) {
  const fd = fs.openSync(file, 'w');
  let size = 0;
  const chunk = [];
  const flush = () => {
    const s = chunk.join('');
    fs.writeSync(fd, s);
    size += Buffer.byteLength(s);
    chunk.length = 0;
  };
  chunk.push(header);
  for (let i = 0; size < target - 200000; i++) {
    chunk.push(line(i));
    if (chunk.length >= 200) flush();
  }
  flush();
  fs.closeSync(fd);
  return fs.statSync(file).size;
}

// Runs the command in a child that reports its own peak memory on exit.
const RUNNER = `
const main = require(${JSON.stringify(bundle)}).main;
main(process.argv.slice(1)).then((code) => {
  process.stderr.write('\\nmaxRSS_KB=' + process.resourceUsage().maxRSS + '\\n');
  process.exitCode = code;
});`;

function run(args) {
  const t0 = performance.now();
  const r = spawnSync(process.execPath, ['-e', RUNNER, ...args], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  const ms = performance.now() - t0;
  const m = /maxRSS_KB=(\d+)/.exec(r.stderr);
  return { ms, rssMb: m ? Number(m[1]) / 1024 : NaN, code: r.status, last: r.stdout.trim().split('\n').pop() || r.stderr.trim().split('\n')[0] };
}

function bench(label, args) {
  const runs = [run(args), run(args), run(args)];
  const ms = runs.map((r) => r.ms).sort((a, b) => a - b);
  const rss = runs.map((r) => r.rssMb).sort((a, b) => a - b);
  console.log(`${label}: ${ms[1].toFixed(0)} ms (${ms[0].toFixed(0)}–${ms[2].toFixed(0)}), peak memory ${rss[1].toFixed(0)} MB (${rss[0].toFixed(0)}–${rss[2].toFixed(0)}), exit ${runs[0].code}: ${runs[0].last}`);
}

try {
  const tail = ','.repeat(5000);
  const wide = path.join(dir, 'wide.csv');
  const wideSize = writeLines(wide, `analyte,cvi,source${tail}\r\n`, (i) => `Analyte ${i},${(1 + (i % 9) / 10).toFixed(1)},Invented for the benchmark${tail}\r\n`, targetBytes);
  console.log(`wide.csv: ${wideSize.toLocaleString('en-US')} bytes, 5,000 empty columns after the last value of every line`);
  bench('leeway check wide.csv', ['check', wide]);

  const long = path.join(dir, 'long.csv');
  const longSize = writeLines(long, 'analyte,specimen,unit,cvi,cvg,source,note\r\n', (i) => `Analyte ${i},serum,mmol/L,${(1 + (i % 90) / 10).toFixed(1)},${(2 + (i % 40) / 10).toFixed(1)},"Invented for the benchmark, row ${i}",a note that makes the row as long as the rows of a real table\r\n`, targetBytes);
  console.log(`long.csv: ${longSize.toLocaleString('en-US')} bytes`);
  bench('leeway check long.csv', ['check', long]);

  const over = path.join(dir, 'over.csv');
  fs.writeFileSync(over, 'analyte,cvi,source\n');
  fs.truncateSync(over, 100 * 1024 * 1024 + 1);
  bench('leeway check over.csv (sparse, 1 byte over the limit)', ['check', over]);
  bench('leeway check /dev/zero', ['check', '/dev/zero']);
} finally {
  fs.rmSync(dir, { recursive: true, force: true });
}
