import { parseRule, termText } from '../../../src/engine/qc/rules';
import { compileRule } from '../../../src/engine/qc/machine';
import { LeewayError } from '../../../src/engine/errors';

function errorOf(text: string): LeewayError {
  try {
    parseRule(text);
  } catch (e) {
    if (e instanceof LeewayError) return e;
    throw e;
  }
  throw new Error(`"${text}" was accepted`);
}

describe('the control-rule parser (docs/reference/control-rules.md)', () => {
  // The published rule names (Westgard et al. 1981) read into their kinds.
  test('reads each published term', () => {
    expect(parseRule('1-3s').terms).toEqual([{ kind: 'limit', limit: 3 }]);
    expect(parseRule('1-2.5s').terms).toEqual([{ kind: 'limit', limit: 2.5 }]);
    expect(parseRule('2-2s').terms).toEqual([{ kind: 'count', count: 2, limit: 2 }]);
    expect(parseRule('4-1s').terms).toEqual([{ kind: 'count', count: 4, limit: 1 }]);
    expect(parseRule('R-4s').terms).toEqual([{ kind: 'range', limit: 4 }]);
    expect(parseRule('10-x').terms).toEqual([{ kind: 'side', count: 10 }]);
    expect(parseRule('2of3-2s').terms).toEqual([{ kind: 'window', of: 2, window: 3, limit: 2 }]);
  });

  test('reads combinations joined by /, keeping the order written and the usual spelling', () => {
    const r = parseRule('1-3s/2-2s/R-4s/4-1s/10-x');
    expect(r.terms.map((t) => t.kind)).toEqual(['limit', 'count', 'range', 'count', 'side']);
    expect(r.text).toBe('1-3s/2-2s/R-4s/4-1s/10-x');
  });

  test('accepts underscores for "-", any case and spaces around terms', () => {
    const a = parseRule('1_3s/2_2s/R_4s');
    const b = parseRule(' 1-3S / 2-2s/r-4s ');
    expect(a.text).toBe('1-3s/2-2s/R-4s');
    expect(b.text).toBe('1-3s/2-2s/R-4s');
    expect(parseRule('2OF3_2S').text).toBe('2of3-2s');
    expect(parseRule('10_X').text).toBe('10-x');
  });

  test('the key does not depend on the order of terms; repeated terms count once', () => {
    expect(parseRule('R-4s/1-3s/2-2s').key).toBe(parseRule('1-3s/2-2s/R-4s').key);
    expect(parseRule('1-3s/1-3s/1-3.0s').text).toBe('1-3s');
    expect(termText({ kind: 'limit', limit: 2.5 })).toBe('1-2.5s');
  });

  test.each([
    ['2-2x', /^rule term "2-2x" is not a control rule/],
    ['1-3s/2-2x', /^rule term "2-2x" is not a control rule/],
    ['13s', /^rule term "13s" is not a control rule/],
    ['R-4', /^rule term "R-4" is not a control rule/],
    ['1-3s/ 4-1', /^rule term "4-1" is not a control rule/],
    ['1-3s//2-2s', /^rule term "" is empty/],
    ['1-3s/', /^rule term "" is empty/],
    ['   ', /^rule is empty/],
    ['1-0s', /^rule term "1-0s" has limit 0: the limit must be a number of SD greater than 0/],
    ['R-0s', /^rule term "R-0s" has limit 0/],
    ['0-2s', /^rule term "0-2s" has count 0/],
    ['1-x', /^rule term "1-x" has count 1: it must be a whole number from 2/],
    ['101-x', /^rule term "101-x" has count 101/],
    ['3of2-2s', /^rule term "3of2-2s" must have 2 ≤ a ≤ b ≤ 6/],
    ['2of7-2s', /^rule term "2of7-2s" must have 2 ≤ a ≤ b ≤ 6/],
    ['1-3s/2-2s/R-4s/4-1s/10-xs', /^rule term "10-xs"/],
  ])('"%s" is #VALUE! naming the bad term', (text, message) => {
    const e = errorOf(text);
    expect(e.code).toBe('#VALUE!');
    expect(e.message).toMatch(message);
  });
});

describe('the compiled rule machine', () => {
  // Counted by hand: a state is (2-2s run, 4-1s run, 10-x run); after j ≥ 1 observations on one
  // side the 10-x run is j (1…9), the 4-1s run 0…min(j, 3), and the 2-2s run 0 or 1 but 1 only
  // when the 4-1s run is ≥ 1: 1 + 2·min(j, 3) states; per side 3 + 5 + 7·7 = 57; with the start,
  // 2·57 + 1 = 115.
  test('1-3s/2-2s/R-4s/4-1s/10-x has 115 states over 8 interval classes', () => {
    const m = compileRule(parseRule('1-3s/2-2s/R-4s/4-1s/10-x'));
    expect(m.states).toBe(115);
    expect(Array.from(m.bounds)).toEqual([-3, -2, -1, 0, 1, 2, 3]);
    expect(m.classes).toBe(8);
    expect(m.rangeLimit).toBe(4);
  });

  test('every transition leads to a state or to rejection; 1-3s rejects from every state', () => {
    const m = compileRule(parseRule('1-3s/2-2s/R-4s/4-1s/10-x'));
    for (let s = 0; s < m.states; s++) {
      expect(m.next[s * m.classes]).toBe(-1);
      expect(m.next[s * m.classes + m.classes - 1]).toBe(-1);
      for (let k = 0; k < m.classes; k++) expect(m.next[s * m.classes + k]).toBeLessThan(m.states);
    }
  });

  test('the smallest range limit is the one kept', () => {
    expect(compileRule(parseRule('R-4s/R-3.5s/1-3s')).rangeLimit).toBe(3.5);
    expect(compileRule(parseRule('1-3s/2-2s')).rangeLimit).toBeUndefined();
  });
});
