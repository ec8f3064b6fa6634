#!/usr/bin/env node
// npm run docs: writes what is generated from the function catalogue into tracked files — the
// README's function table (between its functions:start and functions:end markers) and one
// reference page per function in docs/reference/functions/. `npm run docs -- --check` writes
// nothing and exits 1 when a file differs from what the catalogue gives (the tests run it too).
'use strict';
const fs = require('fs');
const path = require('path');
const { loadCatalogue } = require('./lib/catalogue');
const { root } = require('./lib/load-sources');

/** Every generated file and its content. */
function generated() {
  const c = loadCatalogue();
  const files = new Map();
  const readmePath = path.join(root, 'README.md');
  const readme = fs.readFileSync(readmePath, 'utf8');
  const start = '<!-- functions:start -->\n';
  const end = '<!-- functions:end -->';
  const a = readme.indexOf(start);
  const b = readme.indexOf(end);
  if (a < 0 || b < a) throw new Error('README.md: the functions:start / functions:end markers are missing');
  files.set(readmePath, readme.slice(0, a + start.length) + c.readmeTable() + '\n' + readme.slice(b));
  const dir = path.join(root, 'docs', 'reference', 'functions');
  files.set(path.join(dir, 'README.md'), c.referenceIndex());
  for (const def of c.FUNCTIONS) files.set(path.join(dir, `${def.name}.md`), c.referencePage(def));
  return { files, dir };
}

function main() {
  const check = process.argv.includes('--check');
  const { files, dir } = generated();
  const stale = [];
  for (const [file, text] of files) {
    const now = fs.existsSync(file) ? fs.readFileSync(file, 'utf8') : null;
    if (now === text) continue;
    stale.push(path.relative(root, file));
    if (!check) {
      fs.mkdirSync(path.dirname(file), { recursive: true });
      fs.writeFileSync(file, text);
    }
  }
  // Pages of functions that no longer exist.
  if (fs.existsSync(dir)) {
    for (const f of fs.readdirSync(dir)) {
      const file = path.join(dir, f);
      if (files.has(file)) continue;
      stale.push(path.relative(root, file));
      if (!check) fs.rmSync(file);
    }
  }
  if (check && stale.length) {
    process.stderr.write(`generated from the catalogue but out of date (run npm run docs): ${stale.join(', ')}\n`);
    process.exit(1);
  }
  if (!check) process.stdout.write(stale.length ? `wrote ${stale.join(', ')}\n` : 'every generated file is up to date\n');
}

if (require.main === module) main();
module.exports = { generated };
