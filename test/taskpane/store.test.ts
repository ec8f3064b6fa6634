/**
 * The per-user table library (src/taskpane/store.ts): tables kept between sessions with name,
 * source and import date; rename, delete; a full store says so instead of losing a table.
 */
import { TableLibrary, memoryStore, localStore, defaultStore, chooseStore, uniqueName, LibraryError } from '../../src/taskpane/store';
import type { KeyValueStore } from '../../src/taskpane/store';
import { parseTableText, acceptImport } from '../../src/engine/table';
import * as fs from 'fs';
import * as path from 'path';

const GOOD = fs.readFileSync(path.join(__dirname, '..', 'fixtures', 'tables', 'good.csv'), 'utf8');
const table = (name = 'good') => acceptImport(parseTableText(GOOD, { name, origin: 'good.csv', importedAt: '2026-01-20T10:00:00.000Z' }));

/** A localStorage stand-in (the Storage interface, as in the browser). */
function fakeLocalStorage(limit = Infinity): Storage {
  const m = new Map<string, string>();
  return {
    get length() {
      return m.size;
    },
    clear: () => m.clear(),
    getItem: (k: string) => (m.has(k) ? (m.get(k) as string) : null),
    key: (i: number) => [...m.keys()][i] ?? null,
    removeItem: (k: string) => void m.delete(k),
    setItem: (k: string, v: string) => {
      const size = [...m.entries()].reduce((s, [a, b]) => (a === k ? s : s + a.length + b.length), 0) + k.length + v.length;
      if (size > limit) throw new Error('QuotaExceededError');
      m.set(k, v);
    },
  };
}

describe('table library', () => {
  test('a table added in one session is listed, with its rows, name, sources and import date, in the next', async () => {
    const ls = fakeLocalStorage();
    const first = new TableLibrary(localStore(ls));
    const meta = await first.add(table('Lab table 2026'), 'id1');
    const next = new TableLibrary(localStore(ls));
    expect(await next.list()).toEqual([meta]);
    expect(meta).toMatchObject({ id: 'id1', name: 'Lab table 2026', origin: 'good.csv', importedAt: '2026-01-20T10:00:00.000Z', rowCount: 3, demo: false, sources: 'Invented for tests (2026-01)' });
    const back = await next.get('id1');
    expect(back?.rows).toEqual(table().rows);
    expect(back?.name).toBe('Lab table 2026');
  });

  test('names are kept unique: a second "good" becomes "good (2)"', async () => {
    const lib = new TableLibrary(memoryStore());
    await lib.add(table('good'), 'a');
    const b = await lib.add(table('GOOD'), 'b');
    expect(b.name).toBe('GOOD (2)');
    expect(uniqueName('x', ['x', 'x (2)'])).toBe('x (3)');
  });

  test('rename and delete', async () => {
    const lib = new TableLibrary(memoryStore());
    await lib.add(table('one'), 'a');
    await lib.add(table('two'), 'b');
    expect((await lib.rename('a', '  Chemistry  ')).name).toBe('Chemistry');
    await expect(lib.rename('a', '   ')).rejects.toThrow(LibraryError);
    await lib.remove('b');
    expect((await lib.list()).map((m) => m.name)).toEqual(['Chemistry']);
    expect(await lib.get('b')).toBeNull();
  });

  test('a full store raises a LibraryError that says what to do, and leaves the library as it was', async () => {
    const ls = fakeLocalStorage(2000);
    const lib = new TableLibrary(localStore(ls));
    const big = { ...table('big'), rows: Array.from({ length: 50 }, (_, i) => ({ ...table().rows[0], analyte: `A${i}` })) };
    await expect(lib.add(big, 'x')).rejects.toThrow(/could not be saved on this computer.*Delete a table/);
    expect(await lib.list()).toEqual([]);
    expect(ls.length).toBe(0);
  });

  test('OfficeRuntime.storage is preferred, then localStorage, then memory', async () => {
    const items = new Map<string, string>();
    const ors = { getItem: async (k: string) => items.get(k) ?? null, setItem: async (k: string, v: string) => void items.set(k, v), removeItem: async (k: string) => void items.delete(k) };
    const s1: KeyValueStore = defaultStore({ OfficeRuntime: { storage: ors }, localStorage: fakeLocalStorage() });
    expect(s1.kind).toBe('office-runtime');
    await new TableLibrary(s1).add(table(), 'k');
    expect([...items.keys()].length).toBe(2);
    expect(defaultStore({ localStorage: fakeLocalStorage() }).kind).toBe('local-storage');
    const broken = fakeLocalStorage();
    broken.setItem = () => {
      throw new Error('SecurityError');
    };
    expect(defaultStore({ localStorage: broken }).kind).toBe('memory');
    expect(defaultStore({}).kind).toBe('memory');
  });

  test('OfficeRuntime.storage that refuses (no shared runtime) falls back to localStorage', async () => {
    const refusing = { getItem: async () => null, setItem: async () => Promise.reject(new Error('not available')), removeItem: async () => undefined };
    expect((await chooseStore({ OfficeRuntime: { storage: refusing }, localStorage: fakeLocalStorage() })).kind).toBe('local-storage');
    const items = new Map<string, string>();
    const working = { getItem: async (k: string) => items.get(k) ?? null, setItem: async (k: string, v: string) => void items.set(k, v), removeItem: async (k: string) => void items.delete(k) };
    expect((await chooseStore({ OfficeRuntime: { storage: working }, localStorage: fakeLocalStorage() })).kind).toBe('office-runtime');
    expect(items.size).toBe(0);
  });

  test('an unreadable index is an empty library, not an exception', async () => {
    const ls = fakeLocalStorage();
    ls.setItem('leeway.tables.v1', '{not json');
    expect(await new TableLibrary(localStore(ls)).list()).toEqual([]);
  });
});
