/** npm start (scripts/start.js) on this Linux machine: serves the built add-in over HTTPS and says plainly that it cannot sideload. */
import { spawnSync } from 'child_process';
import * as fs from 'fs';
import * as path from 'path';

test('npm start serves every page over HTTPS, says it cannot sideload here, and never waits for input', () => {
  const port = String(3400 + Math.floor(Math.random() * 500));
  const r = spawnSync(process.execPath, [path.join(__dirname, '..', 'scripts', 'start.js'), '--no-build', '--check', '--port', port], {
    encoding: 'utf8',
    timeout: 120000,
    input: '', // stdin closed: nothing may wait for it
  });
  expect(r.status).toBe(0);
  // The main job on the demo data: the workbook is written and its place is said.
  const demo = path.join(__dirname, '..', 'out', 'leeway-demo.xlsx');
  expect(r.stdout).toContain(`demo workbook: ${demo}`);
  expect(fs.existsSync(demo)).toBe(true);
  // The demo review of an invented year of control results, beside it.
  const review = path.join(__dirname, '..', 'out', 'leeway-review-demo.xlsx');
  expect(r.stdout).toContain(`demo review workbook: ${review}`);
  expect(fs.existsSync(review)).toBe(true);
  expect(r.stdout).toMatch(new RegExp(`serving the add-in at https://localhost:${port}/`));
  for (const page of ['taskpane.html', 'functions.json', 'functions.js', 'commands.html', 'assets/office-js/office.js']) {
    expect(r.stdout).toContain(`${page}: 200`);
  }
  if (process.platform === 'linux') {
    expect(r.stdout).toMatch(/desktop Excel does not run on linux/);
    expect(r.stdout).toMatch(/Upload My Add-in/);
  }
});
