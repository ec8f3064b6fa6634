/** A small option reader for the file commands: --name VALUE, --flag, and positional words. */
import { UsageError } from './call';

export interface OptionSpec {
  /** Options that take a value. */
  readonly values: readonly string[];
  /** Options that are flags. */
  readonly flags: readonly string[];
  /** Options that may be given more than once (values collected in order). */
  readonly repeatable?: readonly string[];
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
    if (!spec.values.includes(name)) throw new UsageError(`${command}: unknown option ${a} (try: leeway help)`);
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
  return { values, flags, positional };
}

export function one(o: Options, name: string): string | undefined {
  return o.values.get(name)?.[0];
}
