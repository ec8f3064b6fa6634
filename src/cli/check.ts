/**
 * `leeway check [T.csv] [--results R.csv] [--eqa E.csv] [--map HEADER=FIELD]`: the task pane's
 * import check on files — a variation table, a control results file, an EQA results file. For
 * each file it prints how it was read (encoding, separator, decimal mark) and how each header was
 * mapped, then each problem with its row (header = row 1) and column, then a count; exits 1 when
 * any file has errors, 0 when none has (warnings alone do not fail).
 */
import * as path from 'path';
import { UsageError } from './call';
import type { Io } from './main';
import { readOptions, one } from './options';
import { readBytes } from './files';
import { parseTableBytes, FIELDS } from '../engine/table';
import { parseResultsBytes, parseEqaBytes, RESULTS_FIELDS, EQA_FIELDS, formatReading, formatReport } from '../engine/import';
import type { ImportReport, ResultsMapping, EqaMapping } from '../engine/import';
import type { HeaderMapping } from '../engine/table';

export const CHECK_USAGE = `  leeway check [T.csv] [--results R.csv] [--eqa E.csv] [--map HEADER=FIELD]
                                   check a variation table, a control results file (--results) or an
                                   EQA results file (--eqa): how each file and header was read, and
                                   every problem with its row and column`;

type Kind = 'table' | 'results' | 'eqa';

export interface KindMappings {
  readonly table: HeaderMapping;
  readonly results: ResultsMapping;
  readonly eqa: EqaMapping;
}

const KIND_FIELDS: Record<Kind, readonly string[]> = { table: FIELDS, results: RESULTS_FIELDS, eqa: EQA_FIELDS };
const KIND_NAME: Record<Kind, string> = { table: 'table', results: 'control results file', eqa: 'EQA results file' };

/**
 * --map "Header text=field" (or "=" / "=ignore" to ignore the column), checked against the fields
 * of the kinds of file being read; each mapping applies to the kinds that have its field.
 */
export function readKindMappings(list: readonly string[] | undefined, command: string, kinds: readonly Kind[]): KindMappings {
  const out: Record<Kind, Record<string, string | null>> = { table: {}, results: {}, eqa: {} };
  const all = [...new Set(kinds.flatMap((k) => KIND_FIELDS[k]))];
  for (const m of list ?? []) {
    const eq = m.lastIndexOf('=');
    if (eq <= 0) throw new UsageError(`${command}: --map needs HEADER=FIELD (got ${m})`);
    const header = m.slice(0, eq).trim();
    const field = m.slice(eq + 1).trim().toLowerCase();
    if (field === '' || field === 'ignore') {
      for (const k of kinds) out[k][header] = null;
      continue;
    }
    if (!all.includes(field)) throw new UsageError(`${command}: --map ${m}: ${field} is not one of ${all.join(', ')} (or "ignore")`);
    for (const k of kinds) if (KIND_FIELDS[k].includes(field)) out[k][header] = field;
  }
  // Every field was checked against the kind's own list above.
  return out as unknown as KindMappings;
}

export function checkCommand(args: string[], io: Io): number {
  const o = readOptions('check', args, { values: ['map', 'results', 'eqa'], flags: [], repeatable: ['map'] });
  if (o.positional.length > 1) throw new UsageError(`check takes one table file (got ${o.positional.length}); a control results file goes after --results, an EQA file after --eqa`);
  const files: Array<{ kind: Kind; file: string }> = [];
  if (o.positional.length) files.push({ kind: 'table', file: o.positional[0] });
  const results = one(o, 'results');
  if (results !== undefined) files.push({ kind: 'results', file: results });
  const eqa = one(o, 'eqa');
  if (eqa !== undefined) files.push({ kind: 'eqa', file: eqa });
  if (files.length === 0) throw new UsageError('check needs a file: leeway check T.csv, leeway check --results R.csv or leeway check --eqa E.csv');
  const mappings = readKindMappings(o.values.get('map'), 'check', files.map((f) => f.kind));

  let failed = false;
  files.forEach(({ kind, file }, i) => {
    const bytes = readBytes(file, KIND_NAME[kind]);
    const options = { name: path.basename(file), origin: path.resolve(file) };
    let report: ImportReport;
    if (kind === 'table') report = parseTableBytes(bytes, { ...options, mapping: mappings.table });
    else if (kind === 'results') report = parseResultsBytes(bytes, { ...options, mapping: mappings.results });
    else report = parseEqaBytes(bytes, { ...options, mapping: mappings.eqa });
    if (files.length > 1) {
      if (i > 0) io.out('');
      io.out(`${KIND_NAME[kind]} ${file}:`);
    }
    for (const line of [...formatReading(report), ...formatReport(report)]) io.out(line);
    if (!report.ok) failed = true;
  });
  return failed ? 1 : 0;
}
