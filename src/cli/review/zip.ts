/**
 * A zip archive built part by part (the container of an .xlsx package): each part is compressed
 * on Node's thread pool as soon as it is added, so the next sheet is built while the last one is
 * compressed, and only the compressed bytes are kept. The archive is the plain zip format (local
 * headers, central directory, end record; no data descriptors, no zip64: a review workbook is far
 * below 4 GB), names in UTF-8, every entry dated 1980-01-01 so the same input gives the same bytes.
 */
import * as zlib from 'zlib';
import { promisify } from 'util';

const deflateRaw = promisify(zlib.deflateRaw);

/** DOS date of 1980-01-01 (day 1, month 1, year 0) and time 00:00:00. */
const DOS_DATE = (1 << 5) | 1;
const DOS_TIME = 0;
/** Bit 11 of the general-purpose flags: the name is UTF-8. */
const UTF8_NAMES = 0x0800;
const STORED = 0;
const DEFLATED = 8;
/** The largest size or offset the plain format records. */
const ZIP32_LIMIT = 0xffffffff;

let crcTable: Int32Array | undefined;

/** CRC-32 (ISO 3309, the zip checksum): Node's own when it has one (Node 20.15 on), else tableCrc32. */
function crc32(data: Uint8Array): number {
  const native = (zlib as unknown as { crc32?: (d: Uint8Array) => number }).crc32;
  return native ? native(data) : tableCrc32(data);
}

/** CRC-32 by a table-driven loop (reflected polynomial 0xEDB88320). */
export function tableCrc32(data: Uint8Array): number {
  if (!crcTable) {
    crcTable = new Int32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      crcTable[n] = c;
    }
  }
  let c = -1;
  for (let i = 0; i < data.length; i++) c = crcTable[(c ^ data[i]) & 0xff] ^ (c >>> 8);
  return (c ^ -1) >>> 0;
}

interface Entry {
  readonly name: Buffer;
  readonly method: number;
  readonly crc: number;
  readonly size: number;
  readonly data: Buffer;
}

export class ZipBuilder {
  private readonly entries: Promise<Entry>[] = [];

  /** Adds a part; text is stored as UTF-8. `compress: false` stores it as is (PNG pictures are compressed already). */
  add(name: string, content: string | Buffer, compress = true): void {
    const raw = typeof content === 'string' ? Buffer.from(content, 'utf8') : content;
    const crc = crc32(raw);
    const nameBytes = Buffer.from(name, 'utf8');
    const entry = compress
      ? deflateRaw(raw).then((data) => ({ name: nameBytes, method: DEFLATED, crc, size: raw.length, data }))
      : Promise.resolve({ name: nameBytes, method: STORED, crc, size: raw.length, data: raw });
    // A failure is reported by finish(); until then it is not an unhandled rejection.
    entry.catch(() => undefined);
    this.entries.push(entry);
  }

  /** The whole archive, parts in the order they were added but [Content_Types].xml first, where readers of packages look for it. */
  async finish(): Promise<Buffer> {
    const all = await Promise.all(this.entries);
    const first = (e: Entry): boolean => e.name.toString('utf8') === '[Content_Types].xml';
    const entries = [...all.filter(first), ...all.filter((e) => !first(e))];
    const chunks: Buffer[] = [];
    const central: Buffer[] = [];
    let offset = 0;
    for (const e of entries) {
      if (e.size > ZIP32_LIMIT || e.data.length > ZIP32_LIMIT || offset > ZIP32_LIMIT) throw new Error('the workbook is too large for the zip format Leeway writes (4 GB)');
      const local = Buffer.alloc(30);
      local.writeUInt32LE(0x04034b50, 0);
      local.writeUInt16LE(20, 4);
      local.writeUInt16LE(UTF8_NAMES, 6);
      local.writeUInt16LE(e.method, 8);
      local.writeUInt16LE(DOS_TIME, 10);
      local.writeUInt16LE(DOS_DATE, 12);
      local.writeUInt32LE(e.crc, 14);
      local.writeUInt32LE(e.data.length, 18);
      local.writeUInt32LE(e.size, 22);
      local.writeUInt16LE(e.name.length, 26);
      local.writeUInt16LE(0, 28);
      const dir = Buffer.alloc(46);
      dir.writeUInt32LE(0x02014b50, 0);
      dir.writeUInt16LE(20, 4);
      dir.writeUInt16LE(20, 6);
      dir.writeUInt16LE(UTF8_NAMES, 8);
      dir.writeUInt16LE(e.method, 10);
      dir.writeUInt16LE(DOS_TIME, 12);
      dir.writeUInt16LE(DOS_DATE, 14);
      dir.writeUInt32LE(e.crc, 16);
      dir.writeUInt32LE(e.data.length, 20);
      dir.writeUInt32LE(e.size, 24);
      dir.writeUInt16LE(e.name.length, 28);
      dir.writeUInt32LE(offset, 42);
      chunks.push(local, e.name, e.data);
      central.push(dir, e.name);
      offset += local.length + e.name.length + e.data.length;
    }
    const centralSize = central.reduce((s, b) => s + b.length, 0);
    if (entries.length > 0xffff || offset > ZIP32_LIMIT) throw new Error('the workbook is too large for the zip format Leeway writes (65,535 parts, 4 GB)');
    const end = Buffer.alloc(22);
    end.writeUInt32LE(0x06054b50, 0);
    end.writeUInt16LE(entries.length, 8);
    end.writeUInt16LE(entries.length, 10);
    end.writeUInt32LE(centralSize, 12);
    end.writeUInt32LE(offset, 16);
    return Buffer.concat([...chunks, ...central, end]);
  }
}
