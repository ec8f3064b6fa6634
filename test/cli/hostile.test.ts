/**
 * Hostile input at the edges of the built `leeway` command (bin/leeway.js): options read
 * strictly, --help for every command, `call --lines` answering every line (and ending quietly
 * when its reader goes away), nesting and length bounds, outputs that are read-only or symbolic
 * links, writes interrupted by a signal or killed outright, and messages that quote the input as
 * typed. Every file is generated into a temporary folder; every value is invented.
 */
import { execFileSync, spawn, spawnSync } from 'child_process';
import * as fs from 'fs';
import * as path from 'path';
import { tempDir, strayFiles } from './support';
import { IMPORT_LIMITS } from '../../src/engine/import';

const ROOT = path.join(__dirname, '..', '..');
const BIN = path.join(ROOT, 'bin', 'leeway.js');

interface Ran {
  code: number | null;
  stdout: string;
  stderr: string;
}

function leeway(args: string[], options: { input?: string; cwd?: string } = {}): Ran {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', timeout: 60000, input: options.input, cwd: options.cwd, maxBuffer: 64 * 1024 * 1024 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const TABLE = 'analyte,specimen,unit,cvi,cvg,source\nArvelin,serum,mmol/L,5.7,6.9,Invented for tests\n"Iron, total",serum,umol/L,11.2,15.4,Invented for tests\nBrontase,serum,U/L,12.4,18.1,Invented for tests\n';

function tableIn(dir: string, text = TABLE): string {
  const file = path.join(dir, 'table.csv');
  fs.writeFileSync(file, text);
  return file;
}

beforeAll(() => {
  // Build once so that no test below pays for (or races on) a rebuild.
  execFileSync(process.execPath, [path.join(ROOT, 'scripts', 'build-cli.js')]);
});

describe('options are read strictly', () => {
  test.each(['0x10', '1e', 'Infinity', '', ' 1', '0b1', '1_0', '1,5', 'NaN', '1e999'])('--z %j is a usage error and nothing is written', (z) => {
    const dir = tempDir('opt-z');
    const r = leeway(['fill', '--table', tableIn(dir), '--out', path.join(dir, 'o.xlsx'), '--z', z]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--z must be a plain decimal number such as 1\.65 \(got ".*"\)/);
    expect(strayFiles(dir, ['table.csv'])).toEqual([]);
  });

  test.each(['1.65', '2', '.5', '1e0', '+2'])('--z %j is a plain decimal number and is used', (z) => {
    const dir = tempDir('opt-z-ok');
    const r = leeway(['fill', '--table', tableIn(dir), '--out', path.join(dir, 'o.xlsx'), '--z', z]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain(`z ${Number(z)}`);
  });

  test('--decimals 0x2 is refused like --z', () => {
    const dir = tempDir('opt-dec');
    expect(leeway(['fill', '--table', tableIn(dir), '--out', path.join(dir, 'o.xlsx'), '--decimals', '0x2']).code).toBe(2);
  });

  test.each(['2026-13-45', '2026-02-30', '2025-02-29', '1900-02-29', '2026-04-31', '2026-00-10', '0000-01-01', '2026-1-5', '26-01-05'])('--date %s is refused by fill and demo', (date) => {
    const dir = tempDir('opt-date');
    const fill = leeway(['fill', '--table', tableIn(dir), '--out', path.join(dir, 'o.xlsx'), '--date', date]);
    expect(fill.code).toBe(2);
    expect(fill.stderr).toMatch(/--date/);
    const demo = leeway(['demo', '--out', path.join(dir, 'd.xlsx'), '--date', date]);
    expect(demo.code).toBe(2);
    expect(strayFiles(dir, ['table.csv'])).toEqual([]);
  });

  test('29 February of a leap year (2024, 2000) is a date', () => {
    const dir = tempDir('opt-leap');
    for (const date of ['2024-02-29', '2000-02-29']) {
      expect(leeway(['fill', '--table', tableIn(dir), '--out', path.join(dir, `${date}.xlsx`), '--date', date]).code).toBe(0);
    }
  });

  test('--out - is an error: a workbook is never written to a pipe, and no file named "-" appears', () => {
    const dir = tempDir('opt-dash');
    for (const args of [['fill', '--table', tableIn(dir), '--out', '-'], ['demo', '--out', '-']]) {
      const r = leeway(args, { cwd: dir });
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(/--out - is not accepted/);
    }
    expect(strayFiles(dir, ['table.csv'])).toEqual([]);
  });

  test('--out must end in .xlsx (x.csv, no extension, .xlsm for a new workbook refused)', () => {
    const dir = tempDir('opt-ext');
    for (const out of ['x.csv', 'x', 'x.xlsx.bak', 'x.xlsm']) {
      const r = leeway(['fill', '--table', tableIn(dir), '--out', path.join(dir, out)]);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/must end in \.xlsx/);
    }
    expect(leeway(['demo', '--out', path.join(dir, 'd.csv')]).code).toBe(2);
    expect(leeway(['fill', '--table', tableIn(dir), '--out', path.join(dir, 'UPPER.XLSX')]).code).toBe(0);
    expect(strayFiles(dir, ['table.csv', 'UPPER.XLSX'])).toEqual([]);
  });

  test('an analyte whose name has a comma: --analyte takes it whole; --analytes says how', () => {
    const dir = tempDir('opt-comma');
    const table = tableIn(dir);
    const whole = leeway(['fill', '--table', table, '--out', path.join(dir, 'a.xlsx'), '--analyte', 'Iron, total', '--analytes', 'Arvelin']);
    expect(whole.code).toBe(0);
    expect(whole.stdout).toMatch(/2 analytes/);
    const split = leeway(['fill', '--table', table, '--out', path.join(dir, 'b.xlsx'), '--analytes', 'Iron, total']);
    expect(split.code).toBe(2);
    expect(split.stderr).toMatch(/--analyte "Iron, total"/);
    expect(fs.existsSync(path.join(dir, 'b.xlsx'))).toBe(false);
  });

  test('an unknown option is a usage error (exit 2) naming the option', () => {
    const r = leeway(['fill', '--tabel', 'x.csv', '--out', 'x.xlsx']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/unknown option --tabel/);
  });

  test.each(['call', 'list', 'help', 'fill', 'check', 'demo'])('leeway %s --help prints its usage and exits 0', (command) => {
    const r = leeway([command, '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain(`leeway ${command}`);
    expect(r.stderr).toBe('');
  });

  test('the usage text documents the --lines error format, --analyte and the option syntax', () => {
    const r = leeway(['help']);
    expect(r.stdout).toContain('"errors": [{"row": R, "col": C, "error": "#CODE!", "message": "..."}]');
    expect(r.stdout).toContain('--analyte NAME');
    expect(r.stdout).toMatch(/Numbers are plain decimals/);
  });
});

describe('call --lines answers every line', () => {
  test('one answer per line, blank and malformed lines included, in order', () => {
    const input = ['["SPEC.CV", 5.7]', '', '   ', 'not json', '[1,2]', '["SPEC.CV", 4]', '{"a":1}', '["SPEC.CV"', '["SPEC.CV", 8]'].join('\n') + '\n';
    const r = leeway(['call', '--lines'], { input });
    expect(r.code).toBe(0);
    const lines = r.stdout.split('\n');
    expect(lines.pop()).toBe('');
    const answers = lines.map((l) => JSON.parse(l));
    expect(answers).toHaveLength(9);
    expect(answers[0]).toEqual({ value: 2.85 });
    expect(answers[1]).toEqual({ error: '#VALUE!', message: expect.stringMatching(/empty/) });
    expect(answers[2]).toEqual({ error: '#VALUE!', message: expect.stringMatching(/empty/) });
    expect(answers[3]).toEqual({ error: '#VALUE!', message: expect.stringMatching(/not JSON/) });
    expect(answers[4].error).toBe('#VALUE!');
    expect(answers[5]).toEqual({ value: 2 });
    expect(answers[6].error).toBe('#VALUE!');
    expect(answers[7].error).toBe('#VALUE!');
    expect(answers[8]).toEqual({ value: 4 });
  });

  test('a line without a final newline and Windows line ends are answered too', () => {
    const r = leeway(['call', '--lines'], { input: '["SPEC.CV", 4]\r\n\r\n["SPEC.CV", 8]' });
    expect(r.stdout.trim().split('\n').map((l) => JSON.parse(l))).toEqual([{ value: 2 }, { error: '#VALUE!', message: expect.any(String) }, { value: 4 }]);
  });

  test('a spill with error cells carries each error with its place and message', () => {
    const r = leeway(['call', '--lines'], { input: '["SPEC.CV", [5, -1, 6]]\n' });
    expect(JSON.parse(r.stdout)).toEqual({
      value: [[2.5], ['#NUM!'], [3]],
      errors: [{ row: 2, col: 1, error: '#NUM!', message: 'cvi must be a finite number ≥ 0 (got -1)' }],
    });
  });

  test('the plain form prints the spill on stdout and each error on stderr, and exits 1', () => {
    const r = leeway(['call', 'SPEC.CV', '[[5, -1], [6, "x"]]']);
    expect(r.code).toBe(1);
    expect(JSON.parse(r.stdout)).toEqual([[2.5, '#NUM!'], [3, '#VALUE!']]);
    expect(r.stderr.trim().split('\n')).toEqual(['row 1, column 2: #NUM! cvi must be a finite number ≥ 0 (got -1)', 'row 2, column 2: #VALUE! cvi must be a number (got text "x")']);
  });

  test('100,000 nested "[" give a clean error, not a stack overflow (a line, and an argument)', () => {
    const deep = '['.repeat(100000);
    const closed = `["SPEC.CV",${'['.repeat(100000)}${']'.repeat(100000)}]`;
    const r = leeway(['call', '--lines'], { input: `${deep}\n${closed}\n["SPEC.CV", 4]\n` });
    expect(r.code).toBe(0);
    const answers = r.stdout.trim().split('\n').map((l) => JSON.parse(l));
    expect(answers).toHaveLength(3);
    expect(answers[0].error).toBe('#VALUE!');
    expect(answers[1]).toEqual({ error: '#VALUE!', message: expect.stringMatching(/nests arrays more than 3 deep/) });
    expect(answers[2]).toEqual({ value: 2 });
    expect(r.stdout + r.stderr).not.toMatch(/call stack/);
    const arg = leeway(['call', 'SPEC.CV', '['.repeat(50000) + ']'.repeat(50000)]);
    expect(arg.code).toBe(2);
    expect(arg.stderr).toMatch(/nests arrays more than 2 deep/);
    expect(arg.stderr.length).toBeLessThan(300);
  });

  test('the reader taking 3 lines of an endless input, and stopping after 1 line: exit 0, nothing on stderr', () => {
    const dir = tempDir('epipe');
    const q = `'${process.execPath}' '${BIN}'`;
    const three = spawnSync('bash', ['-c', `yes '["SPEC.CV",5,"desirable"]' | head -3 | ${q} call --lines`], { encoding: 'utf8', timeout: 60000 });
    expect(three.status).toBe(0);
    expect(three.stdout).toBe('{"value":2.5}\n'.repeat(3));
    const err = path.join(dir, 'err.txt');
    const one = spawnSync('bash', ['-c', `yes '["SPEC.CV",5,"desirable"]' | ${q} call --lines 2>'${err}' | head -1; echo "status \${PIPESTATUS[1]}"`], { encoding: 'utf8', timeout: 60000 });
    expect(one.stdout).toBe('{"value":2.5}\nstatus 0\n');
    expect(fs.readFileSync(err, 'utf8')).toBe('');
    const list = spawnSync('bash', ['-c', `${q} list 2>'${err}' | head -1; echo "status \${PIPESTATUS[0]}"`], { encoding: 'utf8', timeout: 60000 });
    expect(list.stdout).toMatch(/status 0\n$/);
    expect(fs.readFileSync(err, 'utf8')).toBe('');
  });
});

describe('bounds', () => {
  const terms = (n: number): string => Array.from({ length: n }, (_, i) => (i % 2 ? '1-3s' : '2-2s')).join('/');
  const CALLS: Array<[string, (rule: string) => string[]]> = [
    ['QC.DETECT', (r) => [r, '2', '2']],
    ['QC.FALSEREJECT', (r) => [r, '2']],
    ['QC.FLAGS', (r) => ['[1,2,3]', '2', '1', r]],
    ['QC.REVIEW', (r) => ['[1,2,3]', '2', '1', r]],
    ['QC.RISK', (r) => ['6', '1', '1.5', r, '2', '100']],
    ['QC.RUNSIZE', (r) => ['6', '1', '1.5', r, '2']],
  ];

  test.each(CALLS)('%s: a rule of 21 terms or 201 characters is #VALUE! saying so; 20 terms are read', (name, args) => {
    const many = leeway(['call', name, ...args(terms(21))]);
    expect(many.code).toBe(1);
    expect(many.stderr).toMatch(/^#VALUE! rule has 21 terms: at most 20 are accepted/);
    const long = leeway(['call', name, ...args('1-3s' + ' '.repeat(197))]);
    expect(long.code).toBe(1);
    expect(long.stderr).toMatch(/^#VALUE! rule is 201 characters long: at most 200 are accepted/);
    const twenty = leeway(['call', name, ...args(terms(20))]);
    expect(twenty.stderr).not.toMatch(/at most/);
    expect(twenty.code).toBe(0);
  });

  test('QC.PLAN: its candidate rules are read by the same reader, within the bounds', () => {
    const r = leeway(['call', 'QC.PLAN', '10', '1', '2']);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout)[0][0]).toBe('Rule');
  });

  test('tables, control results and EQA files over the size limit are refused from their size alone', () => {
    const dir = tempDir('big');
    const file = path.join(dir, 'huge.csv');
    fs.writeFileSync(file, 'analyte,cvi,source\n');
    fs.truncateSync(file, IMPORT_LIMITS.maxBytes + 1); // sparse: the disk holds almost nothing
    for (const args of [['check', file], ['check', '--results', file], ['check', '--eqa', file], ['fill', '--table', file, '--out', path.join(dir, 'o.xlsx')]]) {
      const r = leeway(args);
      expect(r.code).toBe(1);
      expect(r.stderr).toMatch(/it is 104,857,601 bytes \(100 MiB\), over Leeway's limit of 104,857,600 bytes/);
    }
  });

  test('a table wider than the column limit is refused with the row and the limit', () => {
    const dir = tempDir('wide');
    const file = path.join(dir, 'wide.csv');
    const n = IMPORT_LIMITS.maxColumns + 1;
    fs.writeFileSync(file, ['analyte,cvi,source' + ',x'.repeat(n - 3), 'Arvelin,5.7,Invented' + ',1'.repeat(n - 3)].join('\n') + '\n');
    const r = leeway(['check', file]);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(new RegExp(`${IMPORT_LIMITS.maxColumns}`));
  });

  test('a FIFO and /dev/zero are refused at once with what they are', () => {
    const dir = tempDir('fifo');
    const fifo = path.join(dir, 'pipe.csv');
    execFileSync('mkfifo', [fifo]);
    for (const [args, what] of [[['check', fifo], 'named pipe'], [['check', '--results', '/dev/zero'], 'device'], [['fill', '--table', tableIn(dir), '--template', '/dev/zero', '--out', path.join(dir, 'o.xlsx')], 'device']] as const) {
      const r = leeway([...args]);
      expect(r.code).toBe(1);
      expect(r.stderr).toMatch(new RegExp(`it is a ${what}, not a file`));
    }
  });

  test.each([
    ['lab.xls', /Excel 97–2003 workbook \(\.xls\)/],
    ['encrypted.xlsx', /encrypted workbook/],
    ['lab.ods', /OpenDocument spreadsheet/],
    ['table.csv', /text \(CSV\) file/],
  ])('a template %s is described, without a library address or a stack', (name, what) => {
    const dir = tempDir('tpl');
    const r = leeway(['fill', '--table', tableIn(dir), '--template', path.join(ROOT, 'test', 'fixtures', 'templates', name), '--out', path.join(dir, 'o.xlsx')]);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(what);
    expect(r.stderr).not.toMatch(/https?:|\n\s+at |node_modules/);
    expect(strayFiles(dir, ['table.csv'])).toEqual([]);
  });

  test('bytes that are not a zip, and a damaged zip, are described too', () => {
    const dir = tempDir('tpl-bad');
    fs.writeFileSync(path.join(dir, 'text.xlsx'), 'hello');
    fs.writeFileSync(path.join(dir, 'damaged.xlsx'), Buffer.from('PK\x03\x04 damaged', 'latin1'));
    expect(leeway(['fill', '--table', tableIn(dir), '--template', path.join(dir, 'text.xlsx'), '--out', path.join(dir, 'o.xlsx')]).stderr).toMatch(/not a zip package/);
    expect(leeway(['fill', '--table', tableIn(dir), '--template', path.join(dir, 'damaged.xlsx'), '--out', path.join(dir, 'o.xlsx')]).stderr).toMatch(/damaged/);
  });

  test('a write the system refuses names the output, never the temporary file', () => {
    const dir = tempDir('eacces');
    for (const out of ['/proc/leeway-test.xlsx', '/sys/leeway-test.xlsx']) {
      const r = leeway(['fill', '--table', tableIn(dir), '--out', out]);
      expect(r.code).toBe(1);
      expect(r.stderr).toMatch(new RegExp(`^leeway: cannot write ${out}: `));
      expect(r.stderr).not.toMatch(/\.tmp|EACCES|ENOENT|EROFS/);
    }
  });
});

describe('outputs that are read-only or links', () => {
  test('a read-only file of your own: refused without --force, replaced with it, and still read-only', () => {
    const dir = tempDir('ro');
    const out = path.join(dir, 'o.xlsx');
    expect(leeway(['fill', '--table', tableIn(dir), '--out', out]).code).toBe(0);
    fs.chmodSync(out, 0o444);
    const before = fs.statSync(out);
    const refused = leeway(['fill', '--table', tableIn(dir), '--out', out, '--z', '2']);
    expect(refused.code).toBe(1);
    expect(refused.stderr).toMatch(/exists and is read-only: nothing was written \(add --force/);
    expect(fs.statSync(out).ino).toBe(before.ino);
    const forced = leeway(['fill', '--table', tableIn(dir), '--out', out, '--z', '2', '--force']);
    expect(forced.code).toBe(0);
    const after = fs.statSync(out);
    expect(after.ino).not.toBe(before.ino);
    expect(after.mode & 0o777).toBe(0o444);
    expect(strayFiles(dir, ['table.csv', 'o.xlsx'])).toEqual([]);
  });

  test('a replaced file keeps its mode (0640 stays 0640)', () => {
    const dir = tempDir('mode');
    const out = path.join(dir, 'o.xlsx');
    expect(leeway(['demo', '--out', out]).code).toBe(0);
    fs.chmodSync(out, 0o640);
    expect(leeway(['demo', '--out', out, '--force']).code).toBe(0);
    expect(fs.statSync(out).mode & 0o777).toBe(0o640);
  });

  (process.getuid?.() === 0 ? test : test.skip)('a read-only file of another user is refused even with --force (run as root)', () => {
    const dir = tempDir('ro-other');
    const out = path.join(dir, 'o.xlsx');
    fs.writeFileSync(out, 'theirs');
    fs.chmodSync(out, 0o444);
    fs.chownSync(out, 65534, 65534);
    const r = leeway(['fill', '--table', tableIn(dir), '--out', out, '--force']);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/is read-only and belongs to another user: nothing was written/);
    expect(fs.readFileSync(out, 'utf8')).toBe('theirs');
  });

  test('a symbolic link is never written through: refused, and the link and its target are left as they were', () => {
    const dir = tempDir('link');
    const target = path.join(dir, 'target.xlsx');
    fs.writeFileSync(target, 'the lab file');
    const link = path.join(dir, 'link.xlsx');
    fs.symlinkSync(target, link);
    const dangling = path.join(dir, 'dangling.xlsx');
    fs.symlinkSync(path.join(dir, 'nowhere.xlsx'), dangling);
    for (const out of [link, dangling]) {
      for (const force of [[], ['--force']]) {
        const r = leeway(['fill', '--table', tableIn(dir), '--out', out, ...force]);
        expect(r.code).toBe(1);
        expect(r.stderr).toMatch(/is a symbolic link to .*: nothing was written/);
      }
    }
    expect(fs.readFileSync(target, 'utf8')).toBe('the lab file');
    expect(fs.lstatSync(link).isSymbolicLink()).toBe(true);
    expect(fs.existsSync(path.join(dir, 'nowhere.xlsx'))).toBe(false);
  });
});

describe('interrupted writes', () => {
  /** A table big enough that writing its workbook takes a while (invented values). */
  function bigTable(dir: string): string {
    const rows = ['analyte,specimen,unit,cvi,cvg,source'];
    for (let i = 0; i < 20000; i++) rows.push(`Analyte ${i},serum,mmol/L,${(1 + (i % 90) / 10).toFixed(1)},${(2 + (i % 70) / 10).toFixed(1)},Invented for tests`);
    const file = path.join(dir, 'big.csv');
    fs.writeFileSync(file, rows.join('\n') + '\n');
    return file;
  }

  /** Runs a fill and sends `signal` as soon as its temporary file appears; resolves with how it ended. */
  function fillAndSignal(dir: string, signal: NodeJS.Signals): Promise<{ code: number | null; stderr: string; temporaries: string[] }> {
    return new Promise((resolve, reject) => {
      const child = spawn(process.execPath, [BIN, 'fill', '--table', path.join(dir, 'big.csv'), '--out', path.join(dir, 'big.xlsx')], { stdio: ['ignore', 'ignore', 'pipe'] });
      let stderr = '';
      child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
      let seen: string[] = [];
      const poll = setInterval(() => {
        seen = fs.readdirSync(dir).filter((f) => f.startsWith('.big.xlsx.') && f.endsWith('.tmp'));
        if (seen.length) {
          clearInterval(poll);
          child.kill(signal);
        }
      }, 5);
      child.on('error', reject);
      child.on('exit', (code) => {
        clearInterval(poll);
        resolve({ code, stderr, temporaries: seen });
      });
    });
  }

  test.each([
    ['SIGINT', 130],
    ['SIGTERM', 143],
  ] as const)('%s while the workbook is being written: the temporary is removed, exit %i, nothing written', async (signal, code) => {
    const dir = tempDir(`sig-${signal}`);
    bigTable(dir);
    const r = await fillAndSignal(dir, signal);
    expect(r.temporaries).toHaveLength(1);
    expect(r.code).toBe(code);
    expect(r.stderr).toMatch(new RegExp(`interrupted \\(${signal}\\): nothing was written`));
    expect(strayFiles(dir, ['big.csv'])).toEqual([]);
  });

  test('SIGKILL leaves the temporary; the next write to that name removes it, and only temporaries of dead processes', async () => {
    const dir = tempDir('sig-kill');
    bigTable(dir);
    const r = await fillAndSignal(dir, 'SIGKILL');
    expect(r.code).toBeNull();
    expect(strayFiles(dir, ['big.csv'])).toEqual(r.temporaries);
    const live = `.big.xlsx.${process.pid}.abc.tmp`; // this test's own process: alive
    const otherName = '.other.xlsx.999999999.abc.tmp';
    fs.writeFileSync(path.join(dir, live), '');
    fs.writeFileSync(path.join(dir, otherName), '');
    const small = path.join(dir, 'small.csv');
    fs.writeFileSync(small, TABLE);
    expect(leeway(['fill', '--table', small, '--out', path.join(dir, 'big.xlsx')]).code).toBe(0);
    expect(strayFiles(dir, ['big.csv', 'small.csv', 'big.xlsx']).sort()).toEqual([live, otherName].sort());
  });
});

describe('messages quote the input as typed and name only what was given', () => {
  test.each([
    [['ZSCORE', '2.0000000001'], '(got 2.0000000001)'],
    [['SPEC.CV', '-1.797e308'], '(got -1.797e308)'],
    [['SPEC.TOTAL', '1.797e308', '1.797e308'], ': cvi is 1.797e308, cvg is 1.797e308'],
    [['BV.RCV', '1.797e308', '1'], ': cv is 1.797e308'],
    [['MU.COMBINE', '1.797e308', '1.797e308'], ': u_rw is 1.797e308, u_bias is 1.797e308'],
    [['QC.SHIFT', '1e308', '0', '1e-300'], ': allowable is 1e308, cv is 1e-300'],
  ])('call %j says %s', (args, text) => {
    const r = leeway(['call', ...args]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().endsWith(text)).toBe(true);
    expect(r.stderr).not.toMatch(/Infinity|e\+/);
    expect(r.stderr).not.toMatch(/\b(z|k) is\b/);
  });

  test('QC.PLAN 5 0 5e-324 answers without naming target or limit', () => {
    const r = leeway(['call', 'QC.PLAN', '5', '0', '5e-324']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(JSON.parse(r.stdout)[1][0]).toBe('1-3.5s');
  });

  test('DATA.CV over too few numbers and a zero mean: messages about the data, naming no parameter', () => {
    const few = leeway(['call', 'DATA.CV', '[5, "x", null]']);
    expect(few.stderr.trim()).toBe('#NUM! a sample SD needs at least 2 numbers (got 1)');
    const zero = leeway(['call', 'DATA.CV', '[-1, 1]']);
    expect(zero.stderr.trim()).toBe('#DIV/0! the mean is zero, so a CV (SD / mean) cannot be formed');
  });

  test('a number beyond the double range is quoted as typed, in an argument and on a --lines line', () => {
    const arg = leeway(['call', 'SPEC.CV', '1e309']);
    expect(arg.code).toBe(2);
    expect(arg.stderr.trim()).toBe('leeway: 1e309 is beyond the largest number a cell can hold (about 1.8e308)');
    const line = leeway(['call', '--lines'], { input: '["SPEC.CV", [1, -2e400]]\n' });
    expect(JSON.parse(line.stdout)).toEqual({ error: '#VALUE!', message: '-2e400 is beyond the largest number a cell can hold (about 1.8e308)' });
  });
});

describe('check shows the mapping of every header, with a limit column\'s unit', () => {
  test('"Limit (mmol/L)" → limit_abs in mmol/L; "Limit (mmol/L or %)" reported with its column', () => {
    const dir = tempDir('check-map');
    const good = path.join(dir, 'good.csv');
    fs.writeFileSync(good, 'analyte,cvi,source,Limit (mmol/L),Limit (%),level\nArvelin,5.7,Invented,0.5,10,5\n');
    const r = leeway(['check', good]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('column D "Limit (mmol/L)" → limit_abs, unit mmol/L (another name)');
    expect(r.stdout).toContain('column E "Limit (%)" → limit_pct (another name)');
    const both = path.join(dir, 'both.csv');
    fs.writeFileSync(both, 'analyte,cvi,source,Limit (mmol/L or %)\nArvelin,5.7,Invented,0.5\n');
    const b = leeway(['check', both]);
    expect(b.code).toBe(1);
    expect(b.stdout).toMatch(/row 1, column D: error: "Limit \(mmol\/L or %\)" says "mmol\/L or %": a percent and an amount at once/);
  });

  test('an ambiguous "1,000" in a control results and an EQA file is an error with its row and column', () => {
    const dir = tempDir('check-num');
    const results = path.join(dir, 'r.csv');
    fs.writeFileSync(results, 'analyte,level,run,value,target,sd\nArvelin,1,R1,"1,000",1000,5\n');
    const eqa = path.join(dir, 'e.csv');
    fs.writeFileSync(eqa, 'analyte,round,result,assigned,sd_pt\nArvelin,R1,1.000,1000,5\n');
    const r = leeway(['check', '--results', results, '--eqa', eqa]);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/row 2, column D \(value\): error: value: "1,000" could be 1000/);
    expect(r.stdout).toMatch(/row 2, column C \(result\): error: result: "1\.000" could be 1000/);
  });
});
