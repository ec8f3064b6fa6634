/** The offline manifest check (scripts/check-manifest.js) on the real manifest and on broken copies. */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';

const { checkManifest } = require('../scripts/check-manifest.js') as {
  checkManifest: (manifest: string, dist: string) => Promise<string[]>;
};

const root = path.join(__dirname, '..');
const manifest = path.join(root, 'manifest.xml');
const dist = path.join(root, 'dist', 'addin');

function broken(edit: (s: string) => string): string {
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'manifest-')), 'manifest.xml');
  fs.writeFileSync(file, edit(fs.readFileSync(manifest, 'utf8')));
  return file;
}

describe('manifest (offline check)', () => {
  test('the manifest is well-formed, every resid resolves and every URL points at a built file', async () => {
    expect(fs.existsSync(path.join(dist, 'functions.json'))).toBe(true); // npm test builds first (pretest)
    expect(await checkManifest(manifest, dist)).toEqual([]);
  });

  test('a resid without its resource is reported', async () => {
    const file = broken((s) => s.replace('resid="Group.Label"', 'resid="Group.Missing"'));
    expect((await checkManifest(file, dist)).join('\n')).toMatch(/Group.Missing/);
  });

  test('a URL to a file the build did not produce is reported', async () => {
    const file = broken((s) => s.replace('https://localhost:3000/functions.json', 'https://localhost:3000/nothing.json'));
    expect((await checkManifest(file, dist)).join('\n')).toMatch(/nothing.json/);
  });

  test('malformed XML and a bad Id are reported', async () => {
    expect((await checkManifest(broken((s) => s.replace('</OfficeApp>', '')), dist)).join()).toMatch(/well-formed/);
    expect((await checkManifest(broken((s) => s.replace(/<Id>[^<]+<\/Id>/, '<Id>abc</Id>')), dist)).join()).toMatch(/GUID/);
  });
});
