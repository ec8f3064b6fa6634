/**
 * The `leeway` command line. Exit codes: 0 success, 1 a worksheet error or a failed check,
 * 2 a usage error.
 */
import * as readline from 'readline';
import { callFunction, CallResult, parseCliArg, UsageError } from './call';
import { findFunction, NAMESPACE } from '../registry';
import { helpLines, listLines } from '../registry/metadata';
import { VERSION } from '../engine/version';
import { fillCommand, FILL_USAGE } from './fill';
import { checkCommand, CHECK_USAGE } from './check';
import { demoCommand, DEMO_USAGE } from './demo';
import { reviewCommand, REVIEW_USAGE } from './review';

const USAGE = `leeway ${VERSION} — laboratory quality specifications, performance, QC design and uncertainty

Usage:
  leeway call FUNCTION [ARG ...]   evaluate one worksheet function (with or without the ${NAMESPACE}. prefix)
  leeway call --lines              read ["FUNCTION", arg, ...] per line on stdin, write one JSON result per line
  leeway list                      list the worksheet functions, their parameters and what each gives
  leeway help FUNCTION             one function's help: formula, arguments, defaults, example, sources
${FILL_USAGE}
${CHECK_USAGE}
${DEMO_USAGE}
${REVIEW_USAGE}
  leeway help                      this text

An ARG is a number, a word, or a JSON array for a range ([1,2,3] is a column, [[1,2],[3,4]] rows);
null stands for an omitted optional argument.`;

export interface Io {
  out: (s: string) => void;
  err: (s: string) => void;
}

const stdio: Io = {
  out: (s) => process.stdout.write(s + '\n'),
  err: (s) => process.stderr.write(s + '\n'),
};

function printResult(r: CallResult, io: Io): number {
  if (r.ok) {
    io.out(JSON.stringify(r.value));
    return 0;
  }
  io.err(`${r.error} ${r.message}`);
  return 1;
}

/** One --lines request turned into its JSON reply (never throws). */
export function answerLine(line: string): string {
  let request: unknown;
  try {
    request = JSON.parse(line);
  } catch {
    return JSON.stringify({ error: '#VALUE!', message: 'this line is not JSON: send ["FUNCTION", arg, ...]' });
  }
  if (!Array.isArray(request) || typeof request[0] !== 'string') {
    return JSON.stringify({ error: '#VALUE!', message: 'each line must be a JSON array ["FUNCTION", arg, ...]' });
  }
  try {
    const r = callFunction(request[0], request.slice(1));
    return JSON.stringify(r.ok ? { value: r.value } : { error: r.error, message: r.message });
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    return JSON.stringify({ error: '#VALUE!', message });
  }
}

async function callLines(): Promise<number> {
  const rl = readline.createInterface({ input: process.stdin, crlfDelay: Infinity });
  const chunks: string[] = [];
  for await (const line of rl) {
    if (line.trim() === '') continue;
    chunks.push(answerLine(line));
    if (chunks.length >= 256) {
      process.stdout.write(chunks.join('\n') + '\n');
      chunks.length = 0;
    }
  }
  if (chunks.length) process.stdout.write(chunks.join('\n') + '\n');
  return 0;
}

function list(io: Io): number {
  for (const line of listLines()) io.out(line);
  return 0;
}

function help(args: string[], io: Io): number {
  if (args.length === 0) {
    io.out(USAGE);
    return 0;
  }
  if (args.length > 1) throw new UsageError('help takes one function name: leeway help SPEC.TOTAL');
  const def = findFunction(args[0]);
  if (!def) throw new UsageError(`no worksheet function "${args[0]}" (leeway list shows them all)`);
  for (const line of helpLines(def)) io.out(line);
  return 0;
}

export type Command = (args: string[], io: Io) => Promise<number> | number;

/** Further commands (fill, demo, check, …) register here. */
export const COMMANDS: Record<string, Command> = {
  list: (_a, io) => list(io),
  help,
  call: async (args, io) => {
    if (args[0] === '--lines') {
      if (args.length > 1) throw new UsageError('call --lines takes no further arguments');
      return callLines();
    }
    if (args.length === 0) throw new UsageError('call needs a FUNCTION name');
    return printResult(callFunction(args[0], args.slice(1).map(parseCliArg)), io);
  },
  fill: fillCommand,
  check: checkCommand,
  demo: demoCommand,
  review: reviewCommand,
};

export async function main(argv: string[], io: Io = stdio): Promise<number> {
  const [command, ...rest] = argv;
  if (!command || command === '--help' || command === '-h') {
    io.out(USAGE);
    return command ? 0 : 2;
  }
  if (command === '--version') {
    io.out(VERSION);
    return 0;
  }
  const run = COMMANDS[command];
  try {
    if (!run) throw new UsageError(`unknown command "${command}" (try: leeway help)`);
    return await run(rest, io);
  } catch (e) {
    if (e instanceof UsageError) {
      io.err(`leeway: ${e.message}`);
      return 2;
    }
    io.err(`leeway: ${e instanceof Error ? e.message : String(e)}`);
    return 1;
  }
}

/** The reader of our output went away (`leeway list | head -1`): stop quietly, nothing failed. */
function quietOnClosedPipe(stream: NodeJS.WriteStream): void {
  stream.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(0);
    throw e;
  });
}

/** The command as the `leeway` program runs it: exit status set, a closed pipe ends quietly. */
export function runCli(argv: string[]): Promise<void> {
  quietOnClosedPipe(process.stdout);
  quietOnClosedPipe(process.stderr);
  return main(argv).then((code) => {
    process.exitCode = code;
  });
}

if (require.main === module) void runCli(process.argv.slice(2));
