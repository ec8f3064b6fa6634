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
