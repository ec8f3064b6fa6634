/**
 * The user's table library, kept on their machine between sessions. Per-user storage, not the
 * workbook: OfficeRuntime.storage when the host offers it (shared by the add-in's pages), else the
 * browser's localStorage. Document settings are deliberately not used: they travel with one
 * workbook, and a lab's table belongs to the user, not to a file.
 *
 * Layout: one index key listing every table's metadata, one key per table holding its rows, so
 * listing the library never loads the rows.
 */
import type { VariationRow, VariationTable } from '../engine/table';

/** The small key–value interface every backend offers (all async, as OfficeRuntime.storage is). */
export interface KeyValueStore {
  readonly kind: 'office-runtime' | 'local-storage' | 'memory';
  getItem(key: string): Promise<string | null>;
  setItem(key: string, value: string): Promise<void>;
  removeItem(key: string): Promise<void>;
}

export function memoryStore(): KeyValueStore {
  const map = new Map<string, string>();
  return {
    kind: 'memory',
    getItem: async (k) => (map.has(k) ? (map.get(k) as string) : null),
    setItem: async (k, v) => {
      map.set(k, v);
    },
    removeItem: async (k) => {
      map.delete(k);
    },
  };
}

export function localStore(ls: Storage): KeyValueStore {
  return {
    kind: 'local-storage',
    getItem: async (k) => ls.getItem(k),
    setItem: async (k, v) => ls.setItem(k, v),
    removeItem: async (k) => ls.removeItem(k),
  };
}

interface OfficeRuntimeStorage {
  getItem(key: string): Promise<string | null>;
  setItem(key: string, value: string): Promise<void>;
  removeItem(key: string): Promise<void>;
}

/**
 * The best store this host offers, proven by a write and a read: OfficeRuntime.storage (where
 * the host provides it and it answers), then localStorage, then memory only.
 */
export async function chooseStore(g: Parameters<typeof defaultStore>[0]): Promise<KeyValueStore> {
  const first = defaultStore(g);
  if (first.kind !== 'office-runtime') return first;
  try {
    const probe = '__leeway_probe__';
    await first.setItem(probe, '1');
    const back = await first.getItem(probe);
    await first.removeItem(probe);
    if (back === '1') return first;
  } catch {
    /* OfficeRuntime.storage is present but refuses (no shared runtime): fall back. */
  }
  return defaultStore({ localStorage: g.localStorage });
}

/** The first store this host offers (not yet proven): OfficeRuntime.storage, then localStorage, then memory only. */
export function defaultStore(g: { OfficeRuntime?: { storage?: OfficeRuntimeStorage }; localStorage?: Storage }): KeyValueStore {
  const ors = g.OfficeRuntime?.storage;
  if (ors && typeof ors.getItem === 'function') {
    return {
      kind: 'office-runtime',
      getItem: (k) => ors.getItem(k),
      setItem: (k, v) => ors.setItem(k, v),
      removeItem: (k) => ors.removeItem(k),
    };
  }
  try {
    if (g.localStorage) {
      const probe = '__leeway_probe__';
      g.localStorage.setItem(probe, '1');
      g.localStorage.removeItem(probe);
      return localStore(g.localStorage);
    }
  } catch {
    /* localStorage disabled (private mode, policy): fall through to memory. */
  }
  return memoryStore();
}

/** What the library lists about a table without loading its rows. */
export interface TableMeta {
  readonly id: string;
  readonly name: string;
  /** Where the table came from: file name or worksheet range. */
  readonly origin: string;
  /** The sources the rows name ("where the values come from, with date"), distinct, joined by "; ". */
  readonly sources: string;
  /** ISO date-time of the import. */
  readonly importedAt: string;
  readonly rowCount: number;
  /** True only for the built-in demo table. */
  readonly demo: boolean;
}

const INDEX_KEY = 'leeway.tables.v1';
const rowsKey = (id: string): string => `leeway.table.v1.${id}`;

/** A storage failure the user must hear about (quota full, storage disabled). */
export class LibraryError extends Error {}

/** The distinct sources of a table's rows, in first-seen order, joined by "; " (at most 6 shown). */
export function sourcesOf(rows: readonly VariationRow[]): string {
  const seen: string[] = [];
  for (const r of rows) {
    const t = r.source.trim();
    if (t && !seen.includes(t)) seen.push(t);
    if (seen.length > 6) break;
  }
  return seen.length > 6 ? `${seen.slice(0, 6).join('; ')}; …` : seen.join('; ');
}

export function metaOf(id: string, table: VariationTable): TableMeta {
  return {
    id,
    name: table.name,
    origin: table.origin,
    sources: sourcesOf(table.rows),
    importedAt: table.importedAt,
    rowCount: table.rows.length,
    demo: table.demo,
  };
}

export class TableLibrary {
  constructor(private readonly store: KeyValueStore) {}

  get storageKind(): KeyValueStore['kind'] {
    return this.store.kind;
  }

  async list(): Promise<TableMeta[]> {
    const raw = await this.store.getItem(INDEX_KEY);
    if (!raw) return [];
    try {
      const parsed = JSON.parse(raw) as unknown;
      return Array.isArray(parsed) ? (parsed as TableMeta[]) : [];
    } catch {
      return [];
    }
  }

  /** The stored table, or null when it is gone or unreadable. */
  async get(id: string): Promise<VariationTable | null> {
    const meta = (await this.list()).find((m) => m.id === id);
    const raw = await this.store.getItem(rowsKey(id));
    if (!meta || !raw) return null;
    try {
      const rows = JSON.parse(raw) as VariationRow[];
      return { name: meta.name, origin: meta.origin, importedAt: meta.importedAt, demo: false, rows };
    } catch {
      return null;
    }
  }

  /** Saves an accepted table; its name is made unique within the library ("name (2)"). */
  async add(table: VariationTable, id: string = newId()): Promise<TableMeta> {
    const all = await this.list();
    const name = uniqueName(table.name.trim() || 'Variation table', all.map((m) => m.name));
    const meta = metaOf(id, { ...table, name, demo: false });
    try {
      await this.store.setItem(rowsKey(id), JSON.stringify(table.rows));
      await this.store.setItem(INDEX_KEY, JSON.stringify([...all, meta]));
    } catch (e) {
      await this.store.removeItem(rowsKey(id)).catch(() => undefined);
      throw new LibraryError(
        `The table could not be saved on this computer (${e instanceof Error ? e.message : String(e)}). ` +
          'Delete a table you no longer need, or import a smaller one.',
      );
    }
    return meta;
  }

  async rename(id: string, name: string): Promise<TableMeta> {
    const all = await this.list();
    const i = all.findIndex((m) => m.id === id);
    if (i < 0) throw new LibraryError('That table is no longer in the library.');
    const trimmed = name.trim();
    if (!trimmed) throw new LibraryError('A table needs a name.');
    const others = all.filter((m) => m.id !== id).map((m) => m.name);
    const renamed: TableMeta = { ...all[i], name: uniqueName(trimmed, others) };
    all[i] = renamed;
    await this.store.setItem(INDEX_KEY, JSON.stringify(all));
    return renamed;
  }

  async remove(id: string): Promise<void> {
    const all = await this.list();
    await this.store.setItem(INDEX_KEY, JSON.stringify(all.filter((m) => m.id !== id)));
    await this.store.removeItem(rowsKey(id));
  }
}

function newId(): string {
  return `t${Date.now().toString(36)}${Math.floor(Math.random() * 1e9).toString(36)}`;
}

/** `name`, or `name (2)`, `name (3)`… — the first not already taken (case-insensitive). */
export function uniqueName(name: string, taken: readonly string[]): string {
  const lower = new Set(taken.map((t) => t.toLowerCase()));
  if (!lower.has(name.toLowerCase())) return name;
  for (let k = 2; ; k++) {
    const candidate = `${name} (${k})`;
    if (!lower.has(candidate.toLowerCase())) return candidate;
  }
}
