/** Reading inputs and writing outputs for the file commands: clear messages, no partial output. */
import * as fs from 'fs';
import * as path from 'path';
import type ExcelJS from 'exceljs';

/** Reads a text file; a missing or unreadable file is an Error whose message says which and why. */
export function readText(file: string, what: string): string {
  return readBytes(file, what).toString('utf8');
}

/** Reads a file's bytes; a missing or unreadable file is an Error whose message says which and why. */
export function readBytes(file: string, what: string): Buffer {
  try {
    return fs.readFileSync(file);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a folder' : code === 'EACCES' ? 'permission denied' : (e as Error).message;
    throw new Error(`cannot read the ${what} ${file}: ${why}`);
  }
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
