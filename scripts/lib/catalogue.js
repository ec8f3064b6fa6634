// The function catalogue's generated texts (functions.json, help pages, README table, reference
// pages), loaded from the TypeScript sources with esbuild in memory, for the build and `npm run docs`.
'use strict';
const fs = require('fs');
const path = require('path');
const { loadSources, root } = require('./load-sources');

/** The add-in's origin, read from the manifest's functions.json address (one place to change it). */
function addinOrigin() {
  const manifest = fs.readFileSync(path.join(root, 'manifest.xml'), 'utf8');
  const m = /id="Functions\.Metadata\.Url"\s+DefaultValue="(https:\/\/[^/"]+)\//.exec(manifest);
  if (!m) throw new Error('manifest.xml: no Functions.Metadata.Url');
  return m[1];
}

function loadCatalogue() {
  return loadSources("export * from './src/registry/metadata'; export { FUNCTIONS } from './src/registry';", 'catalogue-entry');
}

module.exports = { addinOrigin, loadCatalogue };
