/** Runs the leeway CLI in-process and captures what it prints. */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { main } from '../../src/cli/main';

export interface Run {
  code: number;
  out: string[];
  err: string[];
}

export async function leeway(...argv: string[]): Promise<Run> {
  const out: string[] = [];
  const err: string[] = [];
  const code = await main(argv, { out: (s) => out.push(s), err: (s) => err.push(s) });
  return { code, out, err };
}

export function tempDir(prefix: string): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), `leeway-${prefix}-`));
}

/** Files in a folder other than the expected ones (temporary files left behind, say). */
export function strayFiles(dir: string, expected: readonly string[]): string[] {
  return fs.readdirSync(dir).filter((f) => !expected.includes(f));
}

export const TABLES = path.join(__dirname, '..', 'fixtures', 'tables');
