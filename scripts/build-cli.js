// Bundles the CLI (src/cli/main.ts and the engine it uses) into dist/cli/leeway.js with esbuild.
'use strict';
const path = require('path');
const root = path.join(__dirname, '..');
require('esbuild').buildSync({
  entryPoints: [path.join(root, 'src', 'cli', 'main.ts')],
  outfile: path.join(root, 'dist', 'cli', 'leeway.js'),
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  sourcemap: true,
  external: ['exceljs', 'papaparse', 'jszip', 'saxes', '@resvg/resvg-js'],
  logLevel: 'warning',
});
