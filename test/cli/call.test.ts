/** `leeway call` and `leeway call --lines` through the built command (bin/leeway.js), as a user runs it. */
import { spawnSync } from 'child_process';
import * as path from 'path';

const bin = path.join(__dirname, '..', '..', 'bin', 'leeway.js');
const leeway = (args: string[], input?: string) =>
  spawnSync(process.execPath, [bin, ...args], { input, encoding: 'utf8', timeout: 30000 });

describe('leeway call', () => {
  test('prints the value as JSON and exits 0', () => {
    const r = leeway(['call', 'SPEC.TOTAL', '5.7', '6.9', 'desirable']);
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout)).toBeCloseTo(6.939965, 6);
  });

  test('takes the name with the LEEWAY. prefix and JSON arrays as ranges', () => {
    const r = leeway(['call', 'LEEWAY.SPEC.CV', '[4,8]']);
    expect(JSON.parse(r.stdout)).toEqual([[2], [4]]);
    const rows = leeway(['call', 'SPEC.CV', '[[4,8]]', 'min']);
    expect(JSON.parse(rows.stdout)).toEqual([[3, 6]]);
  });

  test('a spill prints as rows', () => {
    const r = leeway(['call', 'SPEC.TIERS', '5.7', '6.9']);
    const v = JSON.parse(r.stdout);
    expect(v[0]).toEqual(['Tier', 'CV', 'Bias', 'Total']);
    expect(v.length).toBe(4);
  });

  test('a worksheet error prints "#CODE! message" on stderr and exits 1', () => {
    const r = leeway(['call', 'SPEC.CV', '-1']);
    expect(r.status).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/^#NUM! cvi must be/);
    expect(leeway(['call', 'SPEC.CV', '5', 'best']).stderr).toMatch(/^#VALUE! tier must be one of/);
  });

  test('a usage error exits 2', () => {
    expect(leeway(['call']).status).toBe(2);
    expect(leeway(['call', 'NO.SUCH']).status).toBe(2);
    expect(leeway(['call', 'SPEC.CV', '1', 'des', '3']).status).toBe(2);
    expect(leeway(['frobnicate']).status).toBe(2);
    expect(leeway(['call', 'SPEC.CV', '[1,']).status).toBe(2);
  });

  test('--lines answers one JSON object per line, in order', () => {
    const input = [
      '["SPEC.CV", 5.7]',
      '["ZSCORE", 0.975]',
      '["SPEC.CV", -1]',
      'not json',
      '["NO.SUCH", 1]',
      '["SPEC.BIAS", [1, 2], [[3, 4]]]',
      '["BV.RCV", 3, 4, null]',
      '["PERF.TIER", 5.7, 6.9, 2, 2, null, "parts"]',
    ].join('\n');
    const r = leeway(['call', '--lines'], input + '\n');
    expect(r.status).toBe(0);
    const lines = r.stdout.trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.length).toBe(8);
    expect(lines[0]).toEqual({ value: 2.85 });
    expect(lines[1].value).toBeCloseTo(1.959964, 6);
    expect(lines[2]).toEqual({ error: '#NUM!', message: expect.stringMatching(/cvi/) });
    expect(lines[3].error).toBe('#VALUE!');
    expect(lines[4].error).toBe('#VALUE!');
    expect(lines[5].error).toBe('#VALUE!');
    expect(lines[6].value).toBeCloseTo(13.8593, 4);
    expect(lines[7]).toEqual({ value: 'desirable' }); // CV 2 ≤ 2.85 and |bias| 2 ≤ 2.24
  });
});
