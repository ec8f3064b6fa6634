/** One version everywhere: package.json, the add-in manifest, the program (provenance, CLI). */
import * as fs from 'fs';
import * as path from 'path';
import { VERSION } from '../src/engine/version';
import { main } from '../src/cli/main';

const root = path.join(__dirname, '..');

describe('the version', () => {
  const pkg = JSON.parse(fs.readFileSync(path.join(root, 'package.json'), 'utf8')) as { version: string };
  const lock = JSON.parse(fs.readFileSync(path.join(root, 'package-lock.json'), 'utf8')) as { version: string };
  const manifest = fs.readFileSync(path.join(root, 'manifest.xml'), 'utf8');

  test('package.json, package-lock.json and the program agree', () => {
    expect(VERSION).toBe(pkg.version);
    expect(lock.version).toBe(pkg.version);
  });

  test('the manifest carries the same version with a fourth part 0 (Office wants four numbers)', () => {
    const m = /<Version>([^<]+)<\/Version>/.exec(manifest);
    expect(m?.[1]).toBe(`${pkg.version}.0`);
  });

  test('leeway --version prints it', async () => {
    const out: string[] = [];
    const code = await main(['--version'], { out: (s) => out.push(s), err: () => undefined });
    expect([code, out]).toEqual([0, [pkg.version]]);
  });
});

/**
 * office.js is copied into the add-in from a dev dependency, so a production audit never sees it:
 * the copy the add-in serves must be the installed package's own file, and the installed version
 * the one package-lock.json pins (1.1.110 was the newest the registry here offered, 2026-12).
 */
describe('the office.js the add-in serves', () => {
  const officeDir = path.join(root, 'node_modules', '@microsoft', 'office-js');
  const served = path.join(root, 'dist', 'addin', 'assets', 'office-js', 'office.js');

  test('is the installed @microsoft/office-js, byte for byte (npm test builds the add-in first)', () => {
    expect(fs.existsSync(served) ? 'built' : `missing ${served}: run npm run build`).toBe('built');
    expect(fs.readFileSync(served).equals(fs.readFileSync(path.join(officeDir, 'dist', 'office.js')))).toBe(true);
  });

  test('at the version package-lock.json pins', () => {
    const lock = JSON.parse(fs.readFileSync(path.join(root, 'package-lock.json'), 'utf8')) as { packages: Record<string, { version: string }> };
    const installed = (JSON.parse(fs.readFileSync(path.join(officeDir, 'package.json'), 'utf8')) as { version: string }).version;
    expect(installed).toBe(lock.packages['node_modules/@microsoft/office-js'].version);
  });
});
