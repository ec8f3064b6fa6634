/** Reading inputs and writing outputs for the file commands: clear messages, no partial output. */
import * as fs from 'fs';
import * as path from 'path';
import type ExcelJS from 'exceljs';
import { IMPORT_LIMITS, describeBytes } from '../engine/import/limits';
import { decodeText } from '../engine/text/decode';

const ERRNO_TEXT: Record<string, string> = {
  ENOENT: 'no such file',
  EISDIR: 'it is a folder',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EROFS: 'the disk is read-only',
  ENOSPC: 'the disk is full',
  EDQUOT: 'the disk quota is used up',
  ENAMETOOLONG: 'the name is too long',
  ENOTDIR: 'a folder in the path is a file',
  EMFILE: 'too many open files',
  EIO: 'an input/output error',
};

/** A system error as a short phrase: never the raw text, which names paths (a temporary's, say). */
function whyNot(e: unknown): string {
  const code = (e as NodeJS.ErrnoException).code;
  if (code && ERRNO_TEXT[code]) return ERRNO_TEXT[code];
  if (code) return `system error ${code}`;
  return e instanceof Error ? e.message : String(e);
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

/** What an output path holds now: nothing, or the file to replace (its mode kept). */
interface Existing {
  readonly mode: number;
}

function isReadOnly(st: fs.Stats): boolean {
  return (st.mode & 0o222) === 0;
}

/**
 * Refuses an output path that cannot or may not be replaced: a missing folder, a folder, a
 * symbolic link (never written through: the link and its target are left alone, and the target's
 * own path replaces it), anything but a regular file, an existing file without --force, and a
 * read-only file that belongs to another user. A read-only file of the user's own is replaced
 * with --force and keeps its mode (still read-only afterwards). Returns what exists.
 */
export function checkOutput(out: string, force: boolean): Existing | undefined {
  const dir = path.dirname(path.resolve(out));
  if (!fs.existsSync(dir)) throw new Error(`cannot write ${out}: the folder ${dir} does not exist`);
  let st: fs.Stats;
  try {
    st = fs.lstatSync(out);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
    throw new Error(`cannot write ${out}: ${whyNot(e)}`, { cause: e });
  }
  if (st.isSymbolicLink()) {
    let target = '';
    try {
      target = fs.readlinkSync(out);
    } catch {
      // The link's text is only for the message.
    }
    throw new Error(`${out} is a symbolic link${target ? ` to ${target}` : ''}: nothing was written (Leeway does not write through a link; give the path of the file itself)`);
  }
  if (st.isDirectory()) throw new Error(`cannot write ${out}: it is a folder`);
  if (!st.isFile()) throw new Error(`cannot write ${out}: ${kindOf(st)}`);
  const ro = isReadOnly(st);
  if (!force) throw new Error(`${out} exists${ro ? ' and is read-only' : ''}: nothing was written (add --force to replace it)`);
  const uid = process.getuid?.();
  if (ro && uid !== undefined && st.uid !== uid) throw new Error(`${out} is read-only and belongs to another user: nothing was written`);
  return { mode: st.mode & 0o7777 };
}

/** Temporaries being written by this process: removed if the process is interrupted. */
const LIVE_TEMPORARIES = new Set<string>();
const SIGNAL_EXIT: Record<string, number> = { SIGINT: 130, SIGTERM: 143 };

function onSignal(signal: NodeJS.Signals): void {
  for (const tmp of LIVE_TEMPORARIES) fs.rmSync(tmp, { force: true });
  LIVE_TEMPORARIES.clear();
  process.stderr.write(`leeway: interrupted (${signal}): nothing was written\n`);
  process.exit(SIGNAL_EXIT[signal]);
}

function track(tmp: string): void {
  if (LIVE_TEMPORARIES.size === 0) for (const sig of Object.keys(SIGNAL_EXIT)) process.on(sig, onSignal);
  LIVE_TEMPORARIES.add(tmp);
}

function untrack(tmp: string): void {
  LIVE_TEMPORARIES.delete(tmp);
  if (LIVE_TEMPORARIES.size === 0) for (const sig of Object.keys(SIGNAL_EXIT)) process.off(sig, onSignal);
}

function escapeRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}

function alive(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Removes temporaries a killed run left beside `abs` (`.NAME.<pid>.<stamp>.tmp`, where NAME is
 * the output's name and no process <pid> is running): SIGKILL or a power cut gives no chance to
 * clean up, so the next write to the same name does it. Other files are never touched.
 */
export function removeStaleTemporaries(abs: string): string[] {
  const dir = path.dirname(abs);
  const pattern = new RegExp(`^\\.${escapeRegExp(path.basename(abs))}\\.(\\d+)\\.[0-9a-z]+\\.tmp$`);
  const removed: string[] = [];
  let names: string[];
  try {
    names = fs.readdirSync(dir);
  } catch {
    return removed;
  }
  for (const name of names) {
    const m = pattern.exec(name);
    if (!m || alive(Number(m[1]))) continue;
    const p = path.join(dir, name);
    try {
      if (fs.lstatSync(p).isFile()) {
        fs.rmSync(p, { force: true });
        removed.push(name);
      }
    } catch {
      // Gone already, or not ours to remove: leave it.
    }
  }
  return removed;
}

/**
 * Writes through a temporary file beside `out` (`.NAME.<pid>.<stamp>.tmp`), then renames it
 * into place: a failure or an interruption (SIGINT, SIGTERM: the temporary is removed, exit 130
 * or 143) leaves no partial file, and an existing file is replaced only whole, keeping its mode.
 * Errors name the output, never the temporary.
 */
async function replaceAtomically(out: string, force: boolean, write: (tmp: string) => Promise<void> | void): Promise<void> {
  checkOutput(out, force);
  const abs = path.resolve(out);
  removeStaleTemporaries(abs);
  const tmp = path.join(path.dirname(abs), `.${path.basename(abs)}.${process.pid}.${Date.now().toString(36)}.tmp`);
  track(tmp);
  try {
    try {
      await write(tmp);
    } catch (e) {
      throw new Error(`cannot write ${out}: ${whyNot(e)}`, { cause: e });
    }
    const existing = checkOutput(out, force);
    if (existing) fs.chmodSync(tmp, existing.mode);
    try {
      fs.renameSync(tmp, abs);
    } catch (e) {
      throw new Error(`cannot write ${out}: ${whyNot(e)}`, { cause: e });
    }
  } finally {
    fs.rmSync(tmp, { force: true });
    untrack(tmp);
  }
}

/** Writes the workbook with exceljs through replaceAtomically. */
export async function writeWorkbookAtomically(wb: ExcelJS.Workbook, out: string, force: boolean): Promise<void> {
  await replaceAtomically(out, force, (tmp) => wb.xlsx.writeFile(tmp));
}

/**
 * Writes bytes through replaceAtomically (also when `out` is the file the bytes were read from:
 * it is replaced whole or not at all).
 */
export async function writeBytesAtomically(bytes: Uint8Array, out: string, force: boolean): Promise<void> {
  await replaceAtomically(out, force, (tmp) => fs.promises.writeFile(tmp, bytes));
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
