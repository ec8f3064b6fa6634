/**
 * `leeway check T.csv [--map HEADER=FIELD]`: the task pane's import check on a file. Prints each
 * problem with its row (header = row 1) and column, then a count; exits 1 when there are errors,
 * 0 when there are none (warnings alone do not fail).
 */
import * as path from 'path';
import { UsageError } from './call';
import type { Io } from './main';
import { readOptions } from './options';
import { readText } from './files';
import { readMappings } from './fill';
import { parseTableText, formatReport } from '../engine/table';

export const CHECK_USAGE = `  leeway check T.csv [--map HEADER=FIELD]
                                   check a variation table: every problem with its row and column`;

export function checkCommand(args: string[], io: Io): number {
  const o = readOptions('check', args, { values: ['map'], flags: [], repeatable: ['map'] });
  if (o.positional.length !== 1) throw new UsageError('check needs one table file: leeway check T.csv');
  const file = o.positional[0];
  const result = parseTableText(readText(file, 'table'), { name: path.basename(file), origin: path.resolve(file), mapping: readMappings(o.values.get('map'), 'check') });
  for (const line of formatReport(result)) io.out(line);
  return result.ok ? 0 : 1;
}
