#!/usr/bin/env node
/**
 * Refreshes the task-pane pictures in docs/ on purpose (tests never write there): runs the browser
 * tests, which leave their screenshots in out/screenshots/, and copies the pictures the
 * documentation uses from there to docs/. Nothing is copied when a test fails or a picture is
 * missing. Needs Debian's Chromium (/usr/bin/chromium), as the browser tests do.
 *
 *   npm run docs:images
 */
const fs = require('fs');
const path = require('path');
const { spawnSync } = require('child_process');

const ROOT = path.resolve(__dirname, '..');
const SHOTS = path.join(ROOT, 'out', 'screenshots');
const DOCS = path.join(ROOT, 'docs');

/** The pictures the documentation shows, as the browser tests name them. */
const IMAGES = [
  'pane-tables.png',
  'pane-import-report.png',
  'pane-fill.png',
  'pane-fill-template.png',
  'pane-whatif.png',
  'pane-explain.png',
  'pane-qc.png',
  'pane-qc-risk.png',
  'pane-verification.png',
  'pane-review.png',
  'pane-summary.png',
  'pane-caution.png',
];

function main() {
  if (!fs.existsSync('/usr/bin/chromium')) {
    console.error('docs:images needs /usr/bin/chromium (Debian\'s chromium package): nothing refreshed.');
    return 1;
  }
  fs.rmSync(SHOTS, { recursive: true, force: true });
  const jest = path.join(ROOT, 'node_modules', 'jest', 'bin', 'jest.js');
  const run = spawnSync(process.execPath, [jest, 'test/browser', '--runInBand'], { cwd: ROOT, stdio: 'inherit' });
  if (run.status !== 0) {
    console.error('docs:images: the browser tests failed; docs/ left as it was.');
    return 1;
  }
  const missing = IMAGES.filter((f) => !fs.existsSync(path.join(SHOTS, f)));
  if (missing.length) {
    console.error(`docs:images: no screenshot ${missing.join(', ')} in out/screenshots; docs/ left as it was.`);
    return 1;
  }
  fs.mkdirSync(DOCS, { recursive: true });
  for (const f of IMAGES) fs.copyFileSync(path.join(SHOTS, f), path.join(DOCS, f));
  console.log(`docs:images: refreshed ${IMAGES.length} pictures in docs/ from out/screenshots/.`);
  return 0;
}

process.exitCode = main();
