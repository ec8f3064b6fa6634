/**
 * QC.FLAGS engine on hand-built series. Each expectation is worked out by hand from the
 * published definitions of the rules (Westgard JO, Barry PL, Hunt MR, Groth T. Clin Chem
 * 1981;27:493–501) as the catalogue applies them to a period of results: z = (value − target)/sd,
 * count terms read in the material's sequence and in the sequence of all results, both in run
 * order; R-Ls within one run, on its last result.
 */
import { controlFlags, evaluateControls, ControlSeries, Entry, Label } from '../../../src/engine/qc/flags';
import { parseRule } from '../../../src/engine/qc/rules';
import { LeewayError } from '../../../src/engine/errors';

/** Flags of z-scores (target 0, sd 1), with optional run and material labels. */
function flagsOf(rule: string, z: Entry[], runs?: Label[], levels?: Label[]): string[] {
  return controlFlags({
    values: z,
    target: z.map(() => 0),
    sd: z.map(() => 1),
    rule: parseRule(rule),
    runs,
    levels,
  });
}

function errorOf(input: ControlSeries): string {
  try {
    controlFlags(input);
  } catch (e) {
    if (e instanceof LeewayError) return `${e.code} ${e.message}`;
    throw e;
  }
  throw new Error('no error');
}

describe('each term of the control-rule syntax, alone', () => {
  test('1-3s: beyond ±3 SD, either side; exactly 3 is not beyond', () => {
    expect(flagsOf('1-3s', [1, 3.5, -3.2, 2.9, 3, -3])).toEqual(['', '1-3s', '1-3s', '', '', '']);
  });

  test('1-2s and 1-2.5s: other limits read the same way', () => {
    expect(flagsOf('1-2s', [2.01, -1.99, -2.5])).toEqual(['1-2s', '', '1-2s']);
    expect(flagsOf('1-2.5s', [2.4, 2.6, -2.51])).toEqual(['', '1-2.5s', '1-2.5s']);
  });

  test('2-2s: two consecutive beyond the same limit; opposite sides do not count; a third fires again', () => {
    expect(flagsOf('2-2s', [2.1, 2.2])).toEqual(['', '2-2s']);
    expect(flagsOf('2-2s', [2.1, -2.2])).toEqual(['', '']);
    expect(flagsOf('2-2s', [-2.1, -2.2, -2.3, 1])).toEqual(['', '2-2s', '2-2s', '']);
    expect(flagsOf('2-2s', [2.1, 1.9, 2.2])).toEqual(['', '', '']);
  });

  test('4-1s: four consecutive beyond +1 SD (or −1 SD); a result inside breaks the count', () => {
    expect(flagsOf('4-1s', [1.1, 1.2, 1.3, 1.4])).toEqual(['', '', '', '4-1s']);
    expect(flagsOf('4-1s', [1.1, 1.2, 0.9, 1.3, 1.4])).toEqual(['', '', '', '', '']);
    expect(flagsOf('4-1s', [-1.1, -1.2, -1.3, -1.4, -1.5])).toEqual(['', '', '', '4-1s', '4-1s']);
    expect(flagsOf('4-1s', [1.1, 1.2, -1.3, 1.4])).toEqual(['', '', '', '']);
  });

  test('3-1s: another count and limit', () => {
    expect(flagsOf('3-1s', [1.5, 2, 1.01])).toEqual(['', '', '3-1s']);
  });

  test('10-x: ten consecutive on one side of the mean; z = 0 breaks the streak', () => {
    const up = [0.1, 0.5, 1, 2, 0.3, 0.2, 0.9, 1.5, 0.4, 0.05, 0.7];
    expect(flagsOf('10-x', up)).toEqual(['', '', '', '', '', '', '', '', '', '10-x', '10-x']);
    const broken = [...up.slice(0, 5), 0, ...up.slice(5)];
    expect(flagsOf('10-x', broken).filter((f) => f !== '')).toEqual([]);
    const down = up.map((z) => -z);
    expect(flagsOf('10-x', down)[9]).toBe('10-x');
    expect(flagsOf('8-x', up)).toEqual(['', '', '', '', '', '', '', '8-x', '8-x', '8-x', '8-x']);
  });

  test('2of3-2s: at a result beyond 2 SD when one of the two before it is beyond the same limit', () => {
    expect(flagsOf('2of3-2s', [2.1, 0, 2.2])).toEqual(['', '', '2of3-2s']);
    // At the sequence's second result the window holds the one before it.
    expect(flagsOf('2of3-2s', [2.1, 2.2])).toEqual(['', '2of3-2s']);
    expect(flagsOf('2of3-2s', [2.1, 0, 0, 2.2])).toEqual(['', '', '', '']);
    expect(flagsOf('2of3-2s', [2.1, 0, -2.2])).toEqual(['', '', '']);
    // The result itself must be beyond: the 0 after two beyond +2 completes nothing.
    expect(flagsOf('2of3-2s', [2.1, 2.2, 0])).toEqual(['', '2of3-2s', '']);
  });

  test('a of b in general (3of4-1s): counts the result and the b − 1 before it', () => {
    expect(flagsOf('3of4-1s', [1.5, 0, 1.2, 1.1])).toEqual(['', '', '', '3of4-1s']);
    expect(flagsOf('3of4-1s', [1.5, 0, 0, 1.2, 1.1])).toEqual(['', '', '', '', '']);
  });

  test('R-4s: within one run, highest minus lowest beyond 4 SD, on the run\'s last result', () => {
    expect(flagsOf('R-4s', [2.1, -2.0], ['a', 'a'])).toEqual(['', 'R-4s']);
    expect(flagsOf('R-4s', [2.5, -1.6, 0], ['a', 'a', 'a'])).toEqual(['', '', 'R-4s']);
    expect(flagsOf('R-4s', [2.0, -1.9], ['a', 'a'])).toEqual(['', '']);
  });

  test('R-4s never reads across runs, nor without run labels (each result its own run)', () => {
    expect(flagsOf('R-4s', [2.1, -2.0], ['a', 'b'])).toEqual(['', '']);
    expect(flagsOf('R-4s', [2.1, -2.0])).toEqual(['', '']);
    expect(flagsOf('R-4s', [3, -3, 3, -3], ['a', 'b', 'c', 'd'])).toEqual(['', '', '', '']);
  });
});

describe('terms in combination', () => {
  test('several terms at one result are joined by "/" in the rule\'s order', () => {
    expect(flagsOf('1-3s/2-2s', [2.5, 3.2])).toEqual(['', '1-3s/2-2s']);
    expect(flagsOf('2-2s/1-3s', [2.5, 3.2])).toEqual(['', '2-2s/1-3s']);
    expect(flagsOf('1-2s/2of3-2s/2-2s', [2.5, 2.2])).toEqual(['1-2s', '1-2s/2of3-2s/2-2s']);
  });

  test('the multirule on a worked series', () => {
    const rule = '1-3s/2-2s/R-4s/4-1s/10-x';
    // Hand-worked: 2.1, 2.3 → 2-2s; 3.2 → 1-3s; 1.1 … 1.4 → 4-1s at the fourth above +1
    // (3.2, then −1.2 breaks, then 1.1, 1.2, 1.3, 1.4).
    const z = [0.5, 2.1, 2.3, -1, 3.2, -1.2, 1.1, 1.2, 1.3, 1.4];
    expect(flagsOf(rule, z)).toEqual(['', '', '2-2s', '', '1-3s', '', '', '', '', '4-1s']);
  });

  test('"2-2s/R-4s" at one result: 2-2s in the material across runs, R-4s within the run', () => {
    // Run 1: L1 at −2.3. Run 2: L2 at +2.2, L1 at −2.1. L1's sequence: −2.3, −2.1 → 2-2s.
    // Run 2's range 2.2 − (−2.1) = 4.3 > 4, reported on its last result.
    const flags = flagsOf('1-3s/2-2s/R-4s', [-2.3, 2.2, -2.1], ['r1', 'r2', 'r2'], ['L1', 'L2', 'L1']);
    expect(flags).toEqual(['', '', '2-2s/R-4s']);
  });

  test('1-3s and R-4s at the same result', () => {
    expect(flagsOf('1-3s/R-4s', [1.5, -3.2], ['a', 'a'])).toEqual(['', '1-3s/R-4s']);
  });

  test('terms that cannot fire in the data give ""', () => {
    expect(flagsOf('1-3s/2-2s/R-4s/4-1s/10-x', [0.1, -0.2, 0.3])).toEqual(['', '', '']);
  });
});

describe('runs and materials', () => {
  test('2-2s within a run across materials (the sequence of all results)', () => {
    expect(flagsOf('2-2s', [2.1, 2.3], ['r1', 'r1'], ['L1', 'L2'])).toEqual(['', '2-2s']);
  });

  test('2-2s within a material across runs (the material\'s sequence)', () => {
    // All results: 2.1, 0, 2.4, 0 (no two consecutive); L1's: 2.1, 2.4.
    expect(flagsOf('2-2s', [2.1, 0, 2.4, 0], ['r1', 'r1', 'r2', 'r2'], ['L1', 'L2', 'L1', 'L2'])).toEqual(['', '', '2-2s', '']);
  });

  test('10-x across runs and materials: five runs of two materials, all above the mean', () => {
    const z = [0.3, 0.4, 0.2, 0.9, 1.1, 0.5, 0.6, 0.1, 0.8, 0.7];
    const runs = [1, 1, 2, 2, 3, 3, 4, 4, 5, 5];
    const levels = ['low', 'high', 'low', 'high', 'low', 'high', 'low', 'high', 'low', 'high'];
    // Each material has only five results; the sequence of all results has ten.
    expect(flagsOf('10-x', z, runs, levels)).toEqual(['', '', '', '', '', '', '', '', '', '10-x']);
  });

  test('4-1s across materials needs the results consecutive in run order', () => {
    const z = [1.5, 1.2, -0.5, 1.3, 1.4, 1.1];
    // All: 1.5, 1.2, −0.5 (break), 1.3, 1.4, 1.1 → three at most; material A: 1.5, −0.5, 1.4;
    // material B: 1.2, 1.3, 1.1 → three. So 4-1s never fires; 3-1s fires at the last result
    // (in both sequences) and nowhere else.
    expect(flagsOf('4-1s', z, [1, 1, 2, 2, 3, 3], ['A', 'B', 'A', 'B', 'A', 'B'])).toEqual(['', '', '', '', '', '']);
    expect(flagsOf('3-1s', z, [1, 1, 2, 2, 3, 3], ['A', 'B', 'A', 'B', 'A', 'B'])).toEqual(['', '', '', '', '', '3-1s']);
  });

  test('a sheet sorted by material, then by run, still reads in run order (a label seen again joins its run)', () => {
    // Rows: L1 d1, L1 d2, L1 d3, L2 d1, L2 d2, L2 d3. In run order the results are
    // d1: (L1 0, L2 2.1), d2: (L1 2.2, L2 0), d3: (L1 0, L2 0), so 2-2s fires at L1 in d2
    // (after L2 in d1), which the row order would miss.
    const z = [0, 2.2, 0, 2.1, 0, 0];
    const runs = ['d1', 'd2', 'd3', 'd1', 'd2', 'd3'];
    const levels = ['L1', 'L1', 'L1', 'L2', 'L2', 'L2'];
    expect(flagsOf('2-2s', z, runs, levels)).toEqual(['', '2-2s', '', '', '', '']);
    // R-4s on the run's last result in the range's order: d1 = rows 1 and 4.
    const zr = [-2.1, 0, 0, 2.2, 0, 0];
    expect(flagsOf('R-4s', zr, runs, levels)).toEqual(['', '', '', 'R-4s', '', '']);
  });

  test('labels: trimmed, any case, and the number 1 and the text "1" are one label', () => {
    expect(flagsOf('R-4s', [2.1, -2.1], [' Run A ', 'run a'])).toEqual(['', 'R-4s']);
    expect(flagsOf('R-4s', [2.1, -2.1], [1, '1'])).toEqual(['', 'R-4s']);
    expect(flagsOf('R-4s', [2.1, -2.1], [1, ' 1 '])).toEqual(['', 'R-4s']);
    expect(flagsOf('2-2s', [2.1, 0, 2.2, 0], [1, 1, 2, 2], ['High', 'low', ' HIGH', 'LOW '])).toEqual(['', '', '2-2s', '']);
    expect(flagsOf('R-4s', [2.1, -2.1], ['1', '1.0'])).toEqual(['', '']);
  });

  test('runs come in the order their labels first appear, also beside a blank value', () => {
    // Rows: [blank, run "b"], [2.1, run "a"], [2.2, run "b"], [0, run "a"]. Run order: b, a —
    // the blank value still places run "b" first — so the results read 2.2 (b), 2.1, 0 (a):
    // 2-2s fires at 2.1.
    expect(flagsOf('2-2s', [null, 2.1, 2.2, 0], ['b', 'a', 'b', 'a'])).toEqual(['', '2-2s', '', '']);
  });
});

describe('entries that are not numbers', () => {
  test('blanks and text are skipped: flag "", and they enter no sequence', () => {
    expect(flagsOf('2-2s', [2.1, null, 'no result', 2.2])).toEqual(['', '', '', '2-2s']);
    expect(flagsOf('4-1s', [1.1, 'x', 1.2, null, 1.3, 1.4])).toEqual(['', '', '', '', '', '4-1s']);
    // A run whose only other entry is blank has one result: no range.
    expect(flagsOf('R-4s', [2.5, null, -2.5], ['a', 'a', 'b'])).toEqual(['', '', '']);
  });

  test('a skipped entry needs no target, sd or labels', () => {
    const flags = controlFlags({
      values: [2.1, null, 'text', 2.2],
      target: [0, null, 'x', 0],
      sd: [1, 0, -1, 1],
      rule: parseRule('2-2s'),
      runs: [1, null, '', 2],
      levels: ['a', undefined, null, 'a'],
    });
    expect(flags).toEqual(['', '', '', '2-2s']);
  });

  test('no numbers at all: every flag is ""', () => {
    expect(flagsOf('1-3s/2-2s', [null, 'a'])).toEqual(['', '']);
    expect(flagsOf('1-3s', [])).toEqual([]);
  });
});

describe('a target and an SD per result', () => {
  test('z uses each result\'s own target and SD', () => {
    // Low level: target 5.0, SD 0.2; high level: target 50, SD 1.5.
    // z: (5.5 − 5)/0.2 = 2.5; (53.1 − 50)/1.5 = 2.0666…; (4.3 − 5)/0.2 = −3.5; (47.2 − 50)/1.5 = −1.866…
    const ev = evaluateControls({
      values: [5.5, 53.1, 4.3, 47.2],
      target: [5, 50, 5, 50],
      sd: [0.2, 1.5, 0.2, 1.5],
      rule: parseRule('1-3s/2-2s'),
      runs: [1, 1, 2, 2],
      levels: ['low', 'high', 'low', 'high'],
    });
    expect(ev.z[0]).toBeCloseTo(2.5, 12);
    expect(ev.z[1]).toBeCloseTo(3.1 / 1.5, 12);
    expect(ev.z[2]).toBeCloseTo(-3.5, 12);
    expect(ev.z[3]).toBeCloseTo(-2.8 / 1.5, 12);
    expect(ev.flags).toEqual(['', '2-2s', '1-3s', '']);
  });

  test('a result exactly at the limit in decimal is on it, whatever the binary rounding', () => {
    // (1.6 − 1)/0.3 computes as 2.0000000000000004 in binary; the result is exactly 2 SD away.
    // (1.3 − 1)/0.1 computes as 3.0000000000000004; exactly 3 SD away: 1-2s, not 1-3s.
    expect((1.6 - 1) / 0.3).toBeGreaterThan(2);
    expect((1.3 - 1) / 0.1).toBeGreaterThan(3);
    const at = controlFlags({ values: [1.6, 1.3], target: [1, 1], sd: [0.3, 0.1], rule: parseRule('1-2s/1-3s'), runs: [1, 2] });
    expect(at).toEqual(['', '1-2s']);
    const past = controlFlags({ values: [1.6001, 1.3001], target: [1, 1], sd: [0.3, 0.1], rule: parseRule('1-2s/1-3s') });
    expect(past).toEqual(['1-2s', '1-2s/1-3s']);
    // R-4s at exactly 4 SD: (1.3 − 1)/0.15 − (0.7 − 1)/0.15 computes as 4.000000000000001.
    expect((1.3 - 1) / 0.15 - (0.7 - 1) / 0.15).toBeGreaterThan(4);
    expect(controlFlags({ values: [1.3, 0.7], target: [1, 1], sd: [0.15, 0.15], rule: parseRule('R-4s'), runs: [1, 1] })).toEqual(['', '']);
    expect(controlFlags({ values: [1.3, 0.6999], target: [1, 1], sd: [0.15, 0.15], rule: parseRule('R-4s'), runs: [1, 1] })).toEqual(['', 'R-4s']);
  });
});

describe('the evaluation details', () => {
  test('runs, materials and positions in run order', () => {
    const ev = evaluateControls({
      values: [0, 1, 'x', 2, 3],
      target: [0, 0, 0, 0, 0],
      sd: [1, 1, 1, 1, 1],
      rule: parseRule('1-3s'),
      runs: ['d2', 'd1', 'd0', 'd2', 'd1'],
      levels: ['A', 'A', 'B', 'B', 'B'],
    });
    // Run "d0" has no number: it is not a run. Order: d2 (rows 1, 4), d1 (rows 2, 5).
    expect(ev.runLabels).toEqual(['d2', 'd1']);
    expect(Array.from(ev.run)).toEqual([0, 1, -1, 0, 1]);
    expect(Array.from(ev.position)).toEqual([0, 2, -1, 1, 3]);
    expect(ev.levelLabels).toEqual(['A', 'B']);
    expect(Array.from(ev.level)).toEqual([0, 0, -1, 1, 1]);
    expect(Array.from(ev.runSizes)).toEqual([2, 2]);
    expect(ev.z).toEqual([0, 1, null, 2, 3]);
    expect(ev.results).toBe(4);
  });
});

describe('bad input', () => {
  const rule = parseRule('1-3s/2-2s');
  const base = (over: Partial<ControlSeries>): ControlSeries => ({
    values: [1, 2, 3],
    target: [0, 0, 0],
    sd: [1, 1, 1],
    rule,
    ...over,
  });
  test.each<[string, Partial<ControlSeries>, RegExp]>([
    ['sd 0', { sd: [1, 1, 0] }, /^#NUM! result 3: sd must be > 0 \(got 0\)$/],
    ['sd negative', { sd: [1, -0.5, 1] }, /^#NUM! result 2: sd must be > 0 \(got -0\.5\)$/],
    ['sd blank', { sd: [1, null, 1] }, /^#N\/A result 2: sd is missing/],
    ['sd text', { sd: ['one', 1, 1] }, /^#VALUE! result 1: sd must be a number \(got text "one"\)$/],
    ['sd NaN', { sd: [1, 1, NaN] }, /^#NUM! result 3: sd must be a finite number \(got NaN\)$/],
    ['target blank', { target: [0, 0, null] }, /^#N\/A result 3: target is missing/],
    ['target text', { target: [0, 'n/a', 0] }, /^#VALUE! result 2: target must be a number \(got text "n\/a"\)$/],
    ['target Infinity', { target: [Infinity, 0, 0] }, /^#NUM! result 1: target must be a finite number/],
    ['value NaN', { values: [1, NaN, 3] }, /^#NUM! result 2: value must be a finite number/],
    ['z too large', { values: [1e308, 1, 1], target: [-1e308, 0, 0], sd: [1e-10, 1, 1] }, /^#NUM! result 1: z = \(value − target\)\/sd is too large/],
    ['target shorter', { target: [0, 0] }, /^#VALUE! target and values do not pair up: values has 3 entries but target has 2/],
    ['sd longer', { sd: [1, 1, 1, 1] }, /^#VALUE! sd and values do not pair up/],
    ['runs shorter', { runs: [1, 2] }, /^#VALUE! runs and values do not pair up/],
    ['levels longer', { levels: [1, 2, 3, 4] }, /^#VALUE! levels and values do not pair up/],
    ['a blank run label', { runs: [1, '  ', 2] }, /^#N\/A result 2: its run label is missing/],
    ['a blank material label', { levels: ['a', 'b', null] }, /^#N\/A result 3: its level label is missing/],
  ])('%s: the Excel error with a message naming the result', (_what, over, message) => {
    expect(errorOf(base(over))).toMatch(message);
  });
});
