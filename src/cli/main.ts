/**
 * The `leeway` command line. Exit codes: 0 success, 1 a worksheet error or a failed check,
 * 2 a usage error.
 */
import * as readline from 'readline';
import { callFunction, CallResult, parseCliArg, parseRequestLine, UsageError } from './call';
import { findFunction, NAMESPACE } from '../registry';
import { helpLines, listLines } from '../registry/metadata';
import { VERSION } from '../engine/version';
import { fillCommand, FILL_USAGE } from './fill';
import { checkCommand, CHECK_USAGE } from './check';
import { demoCommand, DEMO_USAGE } from './demo';
import { reviewCommand, REVIEW_USAGE } from './review';

const CALL_USAGE = `  leeway call FUNCTION [ARG ...]   evaluate one worksheet function (with or without the ${NAMESPACE}. prefix)
  leeway call --lines              read ["FUNCTION", arg, ...] per line on stdin, write one JSON result per line`;
const LIST_USAGE = '  leeway list                      list the worksheet functions, their parameters and what each gives';
const HELP_USAGE = `  leeway help FUNCTION             one function's help: formula, arguments, defaults, example, sources
  leeway help                      this text
  leeway COMMAND --help            one command's usage`;

const USAGE = `leeway ${VERSION} — laboratory quality specifications, performance, QC design and uncertainty

Usage:
${CALL_USAGE}
${LIST_USAGE}
${FILL_USAGE}
${CHECK_USAGE}
${DEMO_USAGE}
${REVIEW_USAGE}
${HELP_USAGE}

An ARG is a number, a word, or a JSON array for a range ([1,2,3] is a column, [[1,2],[3,4]] rows);
null stands for an omitted optional argument. A result that spills prints as rows; an error cell
in it prints as its code, and its message goes to stderr as "row R, column C: #CODE! message"
(exit 1). With --lines every input line gets exactly one output line, in order, blank and
malformed lines included: {"value": V} or {"error": "#CODE!", "message": "..."}, and a spill with
error cells adds "errors": [{"row": R, "col": C, "error": "#CODE!", "message": "..."}] (R and C
count from 1 within the spill).

Options: --name VALUE or --name=VALUE. Numbers are plain decimals (1.65, 2, 1e-3); dates are
YYYY-MM-DD and must exist; --out names an .xlsx file (never "-"). An existing output is replaced
only with --force, and a read-only one only if it is yours; an output that is a symbolic link is
refused (name its target instead).`;

/** Each command's own usage, printed by `leeway COMMAND --help`. */
const COMMAND_USAGE: Record<string, string> = {
  call: CALL_USAGE,
  list: LIST_USAGE,
  help: HELP_USAGE,
  fill: FILL_USAGE,
  check: CHECK_USAGE,
  demo: DEMO_USAGE,
  review: REVIEW_USAGE,
};

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
    for (const e of r.errors ?? []) io.err(`row ${e.row}, column ${e.col}: ${e.error} ${e.message}`);
    return r.errors?.length ? 1 : 0;
  }
  io.err(`${r.error} ${r.message}`);
  return 1;
}

const REQUEST = 'send ["FUNCTION", arg, ...]';

/** One --lines request turned into its JSON reply (never throws). */
export function answerLine(line: string): string {
  if (line.trim() === '') return JSON.stringify({ error: '#VALUE!', message: `this line is empty: ${REQUEST}` });
  let request: unknown;
  try {
    request = parseRequestLine(line);
  } catch (e) {
    const message = e instanceof UsageError ? e.message : `this line is not JSON: ${REQUEST}`;
    return JSON.stringify({ error: '#VALUE!', message });
  }
  if (!Array.isArray(request) || typeof request[0] !== 'string') {
    return JSON.stringify({ error: '#VALUE!', message: `each line must be a JSON array: ${REQUEST}` });
  }
  try {
    const r = callFunction(request[0], request.slice(1));
    if (!r.ok) return JSON.stringify({ error: r.error, message: r.message });
    return JSON.stringify(r.errors ? { value: r.value, errors: r.errors } : { value: r.value });
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    return JSON.stringify({ error: '#VALUE!', message });
  }
}

/**
 * Answers stdin line by line: exactly one reply per line, blank lines included, in order. Replies
 * are written in batches; when the reader goes away (EPIPE) the process ends quietly (runCli).
 */
async function callLines(): Promise<number> {
  const rl = readline.createInterface({ input: process.stdin, crlfDelay: Infinity });
  const chunks: string[] = [];
  for await (const line of rl) {
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
  const run: Command | undefined = Object.hasOwn(COMMANDS, command) ? COMMANDS[command] : undefined;
  if (run && (rest[0] === '--help' || rest[0] === '-h')) {
    io.out(COMMAND_USAGE[command] ?? USAGE);
    return 0;
  }
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
