#!/usr/bin/env node
// The leeway command. Runs the CLI bundle built by `npm run build:cli` (done on `npm ci` by the
// prepare script). From a checkout without the bundle, it builds it first.
'use strict';
const path = require('path');
const fs = require('fs');
const bundle = path.join(__dirname, '..', 'dist', 'cli', 'leeway.js');
if (!fs.existsSync(bundle)) {
  require('child_process').execFileSync(process.execPath, [path.join(__dirname, '..', 'scripts', 'build-cli.js')], {
    stdio: ['ignore', 'ignore', 'inherit'],
  });
}
require(bundle)
  .main(process.argv.slice(2))
  .then((code) => {
    process.exitCode = code;
  });
