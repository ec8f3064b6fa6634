/**
 * A small option reader for the file commands: --name VALUE, --name=VALUE, --flag, and positional
 * words. Values are read strictly: a number is a plain decimal number, a date a real calendar
 * date, and options that mean the same in every command (--date, --out) are checked here.
 */
import { UsageError } from './call';

export interface OptionSpec {
  /** Options that take a value. */
  readonly values: readonly string[];
  /** Options that are flags. */
  readonly flags: readonly string[];
  /** Options that may be given more than once (values collected in order). */
  readonly repeatable?: readonly string[];
  /** File extensions --out may have (default: xlsx only). */
  readonly outExtensions?: readonly string[];
}

export interface Options {
  readonly values: ReadonlyMap<string, string[]>;
  readonly flags: ReadonlySet<string>;
  readonly positional: readonly string[];
}

export function readOptions(command: string, args: readonly string[], spec: OptionSpec): Options {
  const values = new Map<string, string[]>();
  const flags = new Set<string>();
  const positional: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (!a.startsWith('--')) {
      positional.push(a);
      continue;
    }
    const eq = a.indexOf('=');
    const name = (eq > 0 ? a.slice(2, eq) : a.slice(2)).toLowerCase();
    if (spec.flags.includes(name)) {
      if (eq > 0) throw new UsageError(`${command}: --${name} takes no value`);
      flags.add(name);
      continue;
    }
    if (!spec.values.includes(name)) throw new UsageError(`${command}: unknown option ${a} (try: leeway ${command} --help)`);
    let v: string | undefined;
    if (eq > 0) v = a.slice(eq + 1);
    else {
      v = args[++i];
      if (v === undefined || (v.startsWith('--') && v.length > 2)) throw new UsageError(`${command}: --${name} needs a value`);
    }
    const list = values.get(name) ?? [];
    if (list.length && !(spec.repeatable ?? []).includes(name)) throw new UsageError(`${command}: --${name} is given twice`);
    list.push(v);
    values.set(name, list);
  }
  const date = values.get('date')?.[0];
  if (date !== undefined) readDate(date, `${command}: --date`);
  const out = values.get('out')?.[0];
  if (out !== undefined) checkOutName(out, command, spec.outExtensions ?? ['xlsx']);
  return { values, flags, positional };
}

export function one(o: Options, name: string): string | undefined {
  return o.values.get(name)?.[0];
}

/** A plain decimal number as typed: digits with an optional point, sign and exponent; nothing else. */
const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/**
 * A number option read strictly: a plain decimal number ("1.65", "2", "1e-3"). Hexadecimal,
 * binary, "Infinity", an unfinished exponent ("1e"), spaces and empty text are usage errors, and
 * so is a number beyond the range of a double (it would read as Infinity).
 */
export function readDecimal(text: string, what: string): number {
  const x = DECIMAL.test(text) ? Number(text) : NaN;
  if (!Number.isFinite(x)) throw new UsageError(`${what} must be a plain decimal number such as 1.65 (got "${text}")`);
  return x;
}

/**
 * A date option: YYYY-MM-DD naming a day that exists (2026-02-30 and 2026-13-01 are refused;
 * 29 February only in a leap year). Returns the text as given.
 */
export function readDate(text: string, what: string): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
  if (!m) throw new UsageError(`${what} must be a date written YYYY-MM-DD (got "${text}")`);
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const leap = (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
  const days = [31, leap ? 29 : 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31][mo - 1];
  if (y < 1 || days === undefined || d < 1 || d > days) throw new UsageError(`${what} ${text} is not a date in the calendar`);
  return text;
}

/**
 * --out names a file to write: not "-" (a workbook is a zip package, never written to the
 * terminal or a pipe), not empty, and with one of the extensions a spreadsheet program opens.
 */
export function checkOutName(out: string, command: string, extensions: readonly string[]): void {
  if (out === '-') throw new UsageError(`${command}: --out - is not accepted: a workbook is a file, not text for a pipe (give a name such as --out result.xlsx)`);
  if (out.trim() === '') throw new UsageError(`${command}: --out needs a file name`);
  const dot = out.lastIndexOf('.');
  const ext = dot > out.lastIndexOf('/') ? out.slice(dot + 1).toLowerCase() : '';
  if (!extensions.includes(ext)) {
    const others = extensions.filter((e) => e !== 'xlsx').map((e) => '.' + e);
    throw new UsageError(`${command}: --out ${out}: the file written is a workbook, so its name must end in .xlsx${others.length ? ` (or ${others.join(', ')} for a template of that kind)` : ''}`);
  }
}
