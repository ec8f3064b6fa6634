#!/usr/bin/env node
// The leeway command. Runs the CLI bundle that `npm ci` (the prepare script) builds into
// dist/cli/leeway.js; in a checkout where the bundle is missing or older than src/, it rebuilds
// it first (esbuild, well under a second), so the command always runs the sources it sits beside.
'use strict';
const path = require('path');
const fs = require('fs');
const root = path.join(__dirname, '..');
const bundle = path.join(root, 'dist', 'cli', 'leeway.js');

function newestSource(dir) {
  let newest = 0;
  for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, e.name);
    newest = Math.max(newest, e.isDirectory() ? newestSource(p) : fs.statSync(p).mtimeMs);
  }
  return newest;
}

function stale() {
  if (!fs.existsSync(bundle)) return true;
  const src = path.join(root, 'src');
  return fs.existsSync(src) && newestSource(src) > fs.statSync(bundle).mtimeMs;
}

if (stale()) {
  require('child_process').execFileSync(process.execPath, [path.join(root, 'scripts', 'build-cli.js')], {
    stdio: ['ignore', 'ignore', 'inherit'],
  });
}
require(bundle).runCli(process.argv.slice(2));
