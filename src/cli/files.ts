/** Reading inputs and writing outputs for the file commands: clear messages, no partial output. */
import * as fs from 'fs';
import * as path from 'path';
import type ExcelJS from 'exceljs';
import { IMPORT_LIMITS, describeBytes } from '../engine/import/limits';
import { decodeText } from '../engine/text/decode';

function whyNot(e: unknown): string {
  const code = (e as NodeJS.ErrnoException).code;
  return code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a folder' : code === 'EACCES' ? 'permission denied' : (e as Error).message;
}

function kindOf(st: fs.Stats): string {
  if (st.isDirectory()) return 'it is a folder';
  if (st.isFIFO()) return 'it is a named pipe, not a file';
  if (st.isCharacterDevice() || st.isBlockDevice()) return 'it is a device, not a file';
  if (st.isSocket()) return 'it is a socket, not a file';
  return 'it is not a regular file';
}

/**
 * Checks, before anything is read, that `file` is a regular file (not a folder, device, pipe or
 * socket: /dev/zero or a FIFO would never end) of at most `limit` bytes. Returns its size.
 */
export function checkRegularFile(file: string, what: string, limit: number = IMPORT_LIMITS.maxBytes): number {
  let st: fs.Stats;
  try {
    st = fs.statSync(file);
  } catch (e) {
    throw new Error(`cannot read the ${what} ${file}: ${whyNot(e)}`, { cause: e });
  }
  if (!st.isFile()) throw new Error(`cannot read the ${what} ${file}: ${kindOf(st)}`);
  if (st.size > limit) throw new Error(`cannot read the ${what} ${file}: it is ${describeBytes(st.size)}, over Leeway's limit of ${describeBytes(limit)}`);
  return st.size;
}

/**
 * Reads a whole input file as bytes (the importer decodes them), after checkRegularFile. The file
 * is opened without blocking and checked again through the open handle, so a file swapped for a
 * pipe in between is refused too, and no more than `limit` bytes are ever read.
 */
export function readBytes(file: string, what: string, limit: number = IMPORT_LIMITS.maxBytes): Uint8Array {
  checkRegularFile(file, what, limit);
  let fd: number;
  try {
    fd = fs.openSync(file, fs.constants.O_RDONLY | (fs.constants.O_NONBLOCK ?? 0));
  } catch (e) {
    throw new Error(`cannot read the ${what} ${file}: ${whyNot(e)}`, { cause: e });
  }
  try {
    const st = fs.fstatSync(fd);
    if (!st.isFile()) throw new Error(`cannot read the ${what} ${file}: ${kindOf(st)}`);
    if (st.size > limit) throw new Error(`cannot read the ${what} ${file}: it is ${describeBytes(st.size)}, over Leeway's limit of ${describeBytes(limit)}`);
    const buf = Buffer.allocUnsafe(Math.min(st.size, limit) + 1);
    let got = 0;
    for (;;) {
      const n = fs.readSync(fd, buf, got, buf.length - got, null);
      if (n === 0) break;
      got += n;
      if (got > limit) throw new Error(`cannot read the ${what} ${file}: it grew past Leeway's limit of ${describeBytes(limit)} while being read`);
      if (got === buf.length) break;
    }
    return new Uint8Array(buf.buffer, buf.byteOffset, got);
  } finally {
    fs.closeSync(fd);
  }
}


/**
 * Reads a text input through the importers' decoder (any accepted encoding). Prefer readBytes and
 * the importers' parse…Bytes functions, whose report records the encoding and warns about
 * Windows-1252; this one only refuses what cannot be decoded.
 */
export function readText(file: string, what: string): string {
  const decoded = decodeText(readBytes(file, what));
  if (!decoded.ok) throw new Error(`cannot read the ${what} ${file}: ${decoded.message}`);
  return decoded.text;
}

/** Refuses an output path that exists unless forced, or whose folder does not exist. */
export function checkOutput(out: string, force: boolean): void {
  const dir = path.dirname(path.resolve(out));
  if (!fs.existsSync(dir)) throw new Error(`cannot write ${out}: the folder ${dir} does not exist`);
  if (fs.existsSync(out)) {
    if (fs.statSync(out).isDirectory()) throw new Error(`cannot write ${out}: it is a folder`);
    if (!force) throw new Error(`${out} exists: nothing was written (add --force to replace it)`);
  }
}

/**
 * Writes the workbook to a temporary file beside `out`, then renames it into place: a failure
 * leaves no partial file, and an existing file is replaced only whole.
 */
export async function writeWorkbookAtomically(wb: ExcelJS.Workbook, out: string, force: boolean): Promise<void> {
  checkOutput(out, force);
  const abs = path.resolve(out);
  const tmp = path.join(path.dirname(abs), `.${path.basename(abs)}.${process.pid}.${Date.now().toString(36)}.tmp`);
  try {
    await wb.xlsx.writeFile(tmp);
    checkOutput(out, force);
    fs.renameSync(tmp, abs);
  } catch (e) {
    fs.rmSync(tmp, { force: true });
    throw e;
  }
}

/**
 * Writes bytes to a temporary file beside `out`, then renames it into place (also when `out` is
 * the file the bytes were read from: it is replaced whole or not at all).
 */
export function writeBytesAtomically(bytes: Uint8Array, out: string, force: boolean): void {
  checkOutput(out, force);
  const abs = path.resolve(out);
  const tmp = path.join(path.dirname(abs), `.${path.basename(abs)}.${process.pid}.${Date.now().toString(36)}.tmp`);
  try {
    fs.writeFileSync(tmp, bytes);
    checkOutput(out, force);
    fs.renameSync(tmp, abs);
  } catch (e) {
    fs.rmSync(tmp, { force: true });
    throw e;
  }
}

/** Today as YYYY-MM-DD in local time. */
export function today(): string {
  const d = new Date();
  const p = (n: number): string => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}`;
}

/**
 * A new exceljs workbook. exceljs is loaded here, on first use, so commands that never touch a
 * workbook (`leeway call`, `leeway check`) start without it.
 */
export function newWorkbook(): ExcelJS.Workbook {
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  const { Workbook } = require('exceljs') as typeof ExcelJS;
  return new Workbook();
}
