// Loads TypeScript sources for a benchmark script: bundles an entry of re-exports with esbuild in
// memory (nothing written to disk) and returns its exports. External packages stay as they are.
'use strict';
const path = require('path');
const Module = require('module');
const root = path.join(__dirname, '..', '..');

function loadSources(entry, name = 'bench-entry') {
  const built = require('esbuild').buildSync({
    stdin: { contents: entry, resolveDir: root, loader: 'ts', sourcefile: `${name}.ts` },
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'cjs',
    write: false,
    external: ['exceljs', 'papaparse', 'decimal.js', 'hyperformula', 'office-addin-mock', '@resvg/resvg-js'],
    logLevel: 'error',
  });
  const file = path.join(root, `${name}.js`);
  const m = new Module(file);
  m.paths = Module._nodeModulePaths(root);
  m._compile(built.outputFiles[0].text, file);
  return m.exports;
}

module.exports = { loadSources, root };
