/**
 * EQA across rounds (src/engine/eqaRounds.ts): per-round deviation, score (z, z′, ζ), band,
 * running mean and RMS, and the EQA limit; and a comparison round scored against Algorithm A.
 */
import { eqaRounds, eqaLimitPercent, deviationPercent, scoreKindOf, scorePeerRound, NEGLIGIBLE_U_SHARE } from '../../src/engine/eqaRounds';
import type { EqaRoundInput } from '../../src/engine/eqaRounds';
import { consensus, eqaZScore, scoreBand } from '../../src/engine/eqa';
import { explain } from '../../src/engine/assess';
import type { Fig } from '../../src/engine/assess';
import { evaluate } from '../../src/registry';
import { mulberry32, uniform } from '../support/prng';

const v = <T>(f: Fig<T>): T => {
  if (!f.ok) throw new Error(`expected a value, got: ${explain(f)}`);
  return f.value;
};
const round = (label: string, result: number, assigned: number, sdPt: number, uAssigned = 0, uResult?: number): EqaRoundInput => ({ round: label, result, assigned, sdPt, uAssigned, uResult });
const close = (a: number, b: number, rel: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(Math.abs(b), Number.MIN_VALUE));

describe('eqaRounds: hand-computed rounds', () => {
  // By hand: deviations 5, 7.5, −4 %; z = 5/2.5 = 2 exactly; z = 7.5/2.5 = 3 exactly (u 0.75 is
  // exactly 0.3·2.5: negligible, plain z); z′ = −4/√(3² + 4²) = −0.8. Running mean
  // 5, 6.25, 8.5/3; running RMS 5, √((25 + 56.25)/2), √((25 + 56.25 + 16)/3).
  // Limit ± 6 units or ± 5 %, whichever is greater, at 100: 6 %.
  const a = eqaRounds('Demo', [round('R1', 105, 100, 2.5, 0, 3), round('R2', 107.5, 100, 2.5, 0.75), round('R3', 96, 100, 3, 4)], { limit: { absolute: 6, percent: 5 } });

  test('deviation % and the score kind by the 0.3·sd_pt rule (ISO 13528:2015 9.2.1, from memory)', () => {
    expect(a.rounds.map((r) => v(r.deviation))).toEqual([5, 7.5, -4]);
    expect(a.rounds.map((r) => r.scoreKind)).toEqual(['z', 'z', 'z′']);
    expect(v(a.rounds[0].score)).toBe(2);
    expect(v(a.rounds[1].score)).toBe(3);
    close(v(a.rounds[2].score), -0.8, 2e-16);
  });

  test('bands at exactly 2 and 3: satisfactory and unsatisfactory (ISO 13528:2015 9.4.1, from memory)', () => {
    expect(a.rounds.map((r) => v(r.band))).toEqual(['satisfactory', 'unsatisfactory', 'satisfactory']);
    expect(a.summary).toMatchObject({ rounds: 3, satisfactory: 2, questionable: 0, unsatisfactory: 1 });
  });

  test('ζ only where the laboratory gives its uncertainty: 5/3 in round 1', () => {
    close(v(a.rounds[0].zeta), 5 / 3, 2e-16);
    expect(v(a.rounds[0].zetaBand)).toBe('satisfactory');
    expect(a.rounds[1].zeta).toEqual({ ok: false, absent: true, why: 'no laboratory uncertainty given' });
  });

  test('running mean and RMS of the deviation %', () => {
    expect(a.rounds.map((r) => v(r.runningMean))).toEqual([5, 6.25, 8.5 / 3]);
    close(v(a.rounds[1].runningRms), Math.sqrt(81.25 / 2), 2e-16);
    close(v(a.rounds[2].runningRms), Math.sqrt(97.25 / 3), 2e-16);
    expect(a.rounds.map((r) => r.counted)).toEqual([1, 2, 3]);
    close(v(a.summary.rms), Math.sqrt(97.25 / 3), 2e-16);
  });

  test('the EQA limit judged at the assigned value: 6 % at 100, within for 5 and −4, not for 7.5', () => {
    expect(a.rounds.map((r) => v(r.limit))).toEqual([6, 6, 6]);
    expect(a.rounds.map((r) => v(r.withinLimit))).toEqual([true, false, true]);
    expect(a.summary).toMatchObject({ judged: 3, within: 2 });
  });

  test('a deviation exactly at the limit is within it', () => {
    const b = eqaRounds('Demo', [round('R1', 104, 80, 2)], { limit: { absolute: 24 } });
    // 24 units at 80 = 30 %; deviation 100·24/80 = 30 %.
    expect(v(b.rounds[0].limit)).toBe(30);
    expect(v(b.rounds[0].deviation)).toBe(30);
    expect(v(b.rounds[0].withinLimit)).toBe(true);
  });
});

describe('eqaRounds: bands as reported', () => {
  test('a score a hair above 2 that reports as 2.00 is satisfactory; 2.01 is questionable; 2.99 questionable', () => {
    // (10.3 − 10)/0.15 is 2.000000000000005 as doubles; reported to 2 decimals it is 2.00.
    const r = eqaRounds('Demo', [round('a', 10.3, 10, 0.15), round('b', 100.201, 100, 0.1), round('c', 100.299, 100, 0.1)]);
    expect(v(r.rounds[0].score)).toBeGreaterThan(2);
    expect(r.rounds.map((x) => v(x.band))).toEqual(['satisfactory', 'questionable', 'questionable']);
    // On the number as given (bandDecimals 15) the first is questionable.
    expect(v(eqaRounds('Demo', [round('a', 10.3, 10, 0.15)], { bandDecimals: 15 }).rounds[0].band)).toBe('questionable');
  });
});

describe('eqaRounds: errors and absences', () => {
  test('an assigned value of 0: deviation #DIV/0!, the round left out of the later running figures', () => {
    const r = eqaRounds('Demo', [round('a', 102, 100, 1), round('b', 0.5, 0, 1), round('c', 96, 100, 1)], { limit: { percent: 5 } });
    expect(r.rounds[1].deviation).toMatchObject({ ok: false, code: '#DIV/0!' });
    expect(r.rounds[1].runningMean).toMatchObject({ ok: false, code: '#DIV/0!' });
    expect(r.rounds[1].withinLimit).toMatchObject({ ok: false, code: '#DIV/0!' });
    // The score needs no division by the assigned value.
    expect(v(r.rounds[1].score)).toBe(0.5);
    expect(v(r.rounds[2].runningMean)).toBe(-1);
    expect(r.rounds[2].counted).toBe(2);
    expect(r.summary).toMatchObject({ judged: 2, within: 2 });
  });

  test('an absolute limit at a zero assigned value is #DIV/0!; none given is an absence', () => {
    expect(eqaLimitPercent({ absolute: 2 }, 0)).toMatchObject({ ok: false, code: '#DIV/0!' });
    expect(eqaLimitPercent(null, 10)).toEqual({ ok: false, absent: true, why: 'no EQA limit given' });
    expect(eqaLimitPercent({ percent: -1 }, 10)).toMatchObject({ ok: false, code: '#NUM!' });
    expect(v(eqaLimitPercent({ percent: 8 }, 10))).toBe(8);
    const r = eqaRounds('Demo', [round('a', 1, 1, 1)]);
    expect(r.rounds[0].withinLimit).toMatchObject({ ok: false, absent: true });
    expect(r.summary.judged).toBe(0);
  });

  test('sd_pt 0 is the score’s #DIV/0!; a negative u_result is ζ’s #NUM!', () => {
    const r = eqaRounds('Demo', [round('a', 1, 1, 0), round('b', 1, 1, 1, 0, -1)]);
    expect(r.rounds[0].score).toMatchObject({ ok: false, code: '#DIV/0!' });
    expect(r.rounds[0].band).toMatchObject({ ok: false, code: '#DIV/0!' });
    expect(r.rounds[1].zeta).toMatchObject({ ok: false, code: '#NUM!' });
  });

  test('deviations at the edges of the double range: the ratio when the difference overflows, #NUM! beyond', () => {
    expect(deviationPercent(-1e308, 1e308)).toBe(-200);
    expect(() => deviationPercent(1e308, 1e-10)).toThrow(expect.objectContaining({ code: '#NUM!' }));
    expect(deviationPercent(5, 5)).toBe(0);
    expect(deviationPercent(-5, 5)).toBe(-200);
  });

  test('no rounds: an empty summary', () => {
    const r = eqaRounds('Demo', []);
    expect(r.summary.rounds).toBe(0);
    expect(r.summary.mean).toMatchObject({ ok: false, absent: true });
  });
});

describe('eqaRounds: properties (seeded)', () => {
  // Seed 2611: random plausible rounds. The last running mean and RMS equal DATA.BIAS and
  // DATA.RMSBIAS on the same results and assigned values (the registry's functions); RMS ≥ |mean|;
  // each score is EQA.ZSCORE's with or without u by the 0.3 rule, and its band scoreBand's.
  test('running figures agree with DATA.BIAS and DATA.RMSBIAS; scores with EQA.ZSCORE', () => {
    const rand = mulberry32(2611);
    for (let k = 0; k < 200; k++) {
      const n = 1 + Math.floor(rand() * 12);
      const level = 10 ** uniform(rand, -2, 4);
      const rounds = Array.from({ length: n }, (_, i) => {
        const assigned = level * uniform(rand, 0.5, 1.5);
        const sd = assigned * uniform(rand, 0.01, 0.1);
        return round(`R${i + 1}`, assigned + sd * uniform(rand, -4, 4), assigned, sd, rand() < 0.5 ? 0 : sd * uniform(rand, 0, 0.6));
      });
      const a = eqaRounds('P', rounds);
      const results = rounds.map((r) => [r.result]);
      const targets = rounds.map((r) => [r.assigned]);
      const mean = evaluate('DATA.BIAS', [results, targets])[0][0] as number;
      const rms = evaluate('DATA.RMSBIAS', [results, targets])[0][0] as number;
      const last = a.rounds[n - 1];
      expect(Math.abs(v(last.runningMean) - mean)).toBeLessThanOrEqual(1e-13 * rms);
      close(v(last.runningRms), rms, 1e-14);
      for (const r of a.rounds) {
        expect(v(r.runningRms)).toBeGreaterThanOrEqual(Math.abs(v(r.runningMean)) * (1 - 1e-15));
        const u = r.input.uAssigned;
        expect(r.scoreKind).toBe(u <= NEGLIGIBLE_U_SHARE * r.input.sdPt ? 'z' : 'z′');
        const z = r.scoreKind === 'z' ? eqaZScore(r.input.result, r.input.assigned, r.input.sdPt) : eqaZScore(r.input.result, r.input.assigned, r.input.sdPt, u);
        expect(v(r.score)).toBe(z);
        expect(v(r.band)).toBe(scoreBand(z, 2));
        if (r.scoreKind === 'z′') expect(Math.abs(v(r.score))).toBeLessThanOrEqual(Math.abs(r.input.result - r.input.assigned) / r.input.sdPt);
      }
    }
  });

  // Seed 2612: the figures do not depend on the unit. Scaling result, assigned, sd_pt, u and the
  // absolute limit by a power of ten leaves deviations, scores, bands and verdicts as they were
  // (to rounding); common practice, no source.
  test('a change of unit leaves every figure alone', () => {
    const rand = mulberry32(2612);
    for (let k = 0; k < 100; k++) {
      const rounds = Array.from({ length: 6 }, (_, i) => {
        const assigned = uniform(rand, 1, 100);
        const sd = assigned * uniform(rand, 0.02, 0.08);
        return round(`R${i}`, assigned + sd * uniform(rand, -3.5, 3.5), assigned, sd, sd * uniform(rand, 0, 0.5), sd * uniform(rand, 0.5, 2));
      });
      const limit = { absolute: uniform(rand, 0.5, 3), percent: uniform(rand, 2, 10) };
      const f = 1000;
      const base = eqaRounds('U', rounds, { limit });
      const scaled = eqaRounds('U', rounds.map((r) => ({ ...r, result: r.result * f, assigned: r.assigned * f, sdPt: r.sdPt * f, uAssigned: r.uAssigned * f, uResult: (r.uResult as number) * f })), { limit: { absolute: limit.absolute * f, percent: limit.percent } });
      base.rounds.forEach((r, i) => {
        const s = scaled.rounds[i];
        close(v(s.deviation), v(r.deviation), 1e-12);
        close(v(s.score), v(r.score), 1e-12);
        close(v(s.zeta), v(r.zeta), 1e-12);
        close(v(s.limit), v(r.limit), 1e-12);
        expect(s.scoreKind).toBe(r.scoreKind);
        // Away from the boundaries, the band and the verdict are the same.
        if (Math.abs(Math.abs(v(r.score)) - 2) > 1e-6 && Math.abs(Math.abs(v(r.score)) - 3) > 1e-6) expect(v(s.band)).toBe(v(r.band));
        if (Math.abs(Math.abs(v(r.deviation)) - v(r.limit)) > 1e-9) expect(v(s.withinLimit)).toBe(v(r.withinLimit));
      });
    }
  });

  test('the negligibility rule at its boundary: u = 0.3·sd_pt is z, a hair more is z′', () => {
    expect(scoreKindOf(2.5, 0.75)).toBe('z');
    expect(scoreKindOf(2.5, 0.7500000000000001)).toBe('z′');
    expect(scoreKindOf(1, 0)).toBe('z');
  });
});

describe('scorePeerRound: a comparison round scored against Algorithm A', () => {
  test('x*, s* and u(x*) are EQA.CONSENSUS’s; 5 participants give z′ (u/s* = 1.25/√5 > 0.3)', () => {
    const results = [
      { name: 'A', result: 5.02 },
      { name: 'B', result: 4.97 },
      { name: 'C', result: 5.1 },
      { name: 'D', result: 5.05 },
      { name: 'E', result: 5.61 },
    ];
    const p = scorePeerRound(results);
    const c = consensus(results.map((r) => r.result));
    expect(v(p.consensus)).toEqual(c);
    expect(v(p.scoreKind)).toBe('z′');
    p.scores.forEach((s, i) => {
      expect(v(s.score)).toBe(eqaZScore(results[i].result, c.robustMean, c.robustSd, c.uncertainty));
      close(v(s.deviation), (100 * (results[i].result - c.robustMean)) / c.robustMean, 1e-15);
      expect(v(s.band)).toBe(scoreBand(v(s.score), 2));
    });
  });

  test('from 18 participants on, u(x*) ≤ 0.3·s*: plain z (1.25/√18 = 0.295)', () => {
    const rand = mulberry32(2613);
    const results = Array.from({ length: 18 }, (_, i) => ({ name: `S${i}`, result: uniform(rand, 9, 11) }));
    const p = scorePeerRound(results);
    expect(v(p.scoreKind)).toBe('z');
    const c = v(p.consensus);
    expect(v(p.scores[0].score)).toBe(eqaZScore(results[0].result, c.robustMean, c.robustSd));
    expect(v(scorePeerRound(results.slice(0, 17)).scoreKind)).toBe('z′');
  });

  test('fewer than 3 results: the consensus error on every score; equal results: s* = 0, scores #DIV/0!', () => {
    const two = scorePeerRound([{ name: 'A', result: 1 }, { name: 'B', result: 2 }]);
    expect(two.consensus).toMatchObject({ ok: false, code: '#NUM!' });
    expect(two.scores[1].score).toMatchObject({ ok: false, code: '#NUM!' });
    const flat = scorePeerRound([{ name: 'A', result: 3 }, { name: 'B', result: 3 }, { name: 'C', result: 3 }, { name: 'D', result: 4 }]);
    expect(v(flat.consensus).robustSd).toBe(0);
    expect(flat.scores[3].score).toMatchObject({ ok: false, code: '#DIV/0!' });
    expect(v(flat.scores[3].deviation)).toBeCloseTo(100 / 3, 12);
  });
});
