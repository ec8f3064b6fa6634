import { mean, meanPercentBias, rmsPercentBias, sampleCv, summarize, cvPercent } from '../../../src/engine/data/describe';
import { LeewayError } from '../../../src/engine/errors';
import { lre, mulberry32, uniform } from '../../support/prng';
import { lreRow, univariate } from './nist';

// NIST StRD univariate summary statistics (test/fixtures/nist-strd): certified sample mean and
// SD (n − 1); the CV is derived from them, 100·s/ȳ. Required digits (LRE): lower and average
// difficulty ≥ 9; NumAcc4 (higher difficulty, 8 constant leading digits) ≥ 7.
const FILES: Array<[string, string, number]> = [
  ['Michelso', 'lower', 9],
  ['Lottery', 'lower', 9],
  ['Mavro', 'lower', 9],
  ['PiDigits', 'lower', 9],
  ['NumAcc1', 'lower', 9],
  ['NumAcc2', 'average', 9],
  ['NumAcc3', 'average', 9],
  ['NumAcc4', 'higher', 7],
];

describe('DATA.CV against the NIST StRD univariate data sets', () => {
  const table: string[] = [];
  afterAll(() => {
    console.log(['LRE, NIST StRD univariate (mean, SD, CV = 100·s/ȳ):', ...table].join('\n'));
  });

  test.each(FILES)('NIST StRD %s (%s difficulty): mean, SD and CV to the required digits', (file, _level, required) => {
    const d = univariate(file);
    const s = summarize(d.data);
    const cv = sampleCv(d.data);
    const cvCert = (100 * d.sd) / d.mean;
    const rows: Array<[string, number, number]> = [
      ['mean', s.mean, d.mean],
      ['SD', s.sd, d.sd],
      ['CV %', cv, cvCert],
    ];
    for (const [q, got, cert] of rows) {
      const digits = lre(got, cert);
      table.push(lreRow(file, q, got, cert, digits, required));
      expect(digits).toBeGreaterThanOrEqual(required);
    }
  });
});

describe('DATA.CV rules', () => {
  test('if given fewer than 2 numbers, throws #NUM!', () => {
    expect(() => sampleCv([5])).toThrow(expect.objectContaining({ code: '#NUM!' }));
    expect(() => sampleCv([])).toThrow(LeewayError);
  });

  test('if the mean is zero, throws #DIV/0!', () => {
    expect(() => sampleCv([-1, 1])).toThrow(expect.objectContaining({ code: '#DIV/0!' }));
    expect(() => cvPercent(1, 0)).toThrow(expect.objectContaining({ code: '#DIV/0!' }));
  });

  // Common practice, no source: 2, 4, 4, 4, 5, 5, 7, 9 has mean 5 and n − 1 SD √(32/7).
  test('a hand-checkable sample: mean 5, SD √(32/7)', () => {
    const xs = [2, 4, 4, 4, 5, 5, 7, 9];
    expect(mean(xs)).toBe(5);
    expect(Math.abs(summarize(xs).sd - Math.sqrt(32 / 7))).toBeLessThanOrEqual(1e-15 * Math.sqrt(32 / 7));
    expect(Math.abs(sampleCv(xs) - (100 * Math.sqrt(32 / 7)) / 5)).toBeLessThanOrEqual(1e-13);
  });

  // Seed 3001: a CV does not change when every result is scaled, and an SD not when shifted.
  test('properties: CV scale-free, SD shift-free', () => {
    const rand = mulberry32(3001);
    for (let i = 0; i < 500; i++) {
      const n = 2 + Math.floor(rand() * 40);
      const xs = Array.from({ length: n }, () => uniform(rand, 1, 100));
      const s = uniform(rand, 1e-3, 1e3);
      const c = uniform(rand, -1e6, 1e6);
      const cv = sampleCv(xs);
      expect(Math.abs(sampleCv(xs.map((x) => s * x)) - cv)).toBeLessThanOrEqual(1e-12 * Math.abs(cv));
      const sd = summarize(xs).sd;
      expect(Math.abs(summarize(xs.map((x) => x + c)).sd - sd)).toBeLessThanOrEqual(1e-8 * sd);
    }
  });
});

describe('DATA.BIAS and DATA.RMSBIAS', () => {
  // Nordtest TR 537 §6.1 single-CRM example, second-hand (values quoted from a summary of the
  // handbook's worked examples, not checked against the handbook itself): certified 11.5, lab mean 11.9 → bias 3.48 %.
  test('Nordtest TR 537 single CRM: bias of 11.9 against 11.5 is 3.48 % (second-hand)', () => {
    const b = meanPercentBias([11.9], [11.5]);
    expect(Math.abs(b - 3.48)).toBeLessThan(0.005);
    expect(Math.abs(b - (100 * 0.4) / 11.5)).toBeLessThanOrEqual(1e-13);
  });

  // Nordtest TR 537 §3.2 ammonium example, second-hand (quoted from a summary of the handbook): six PT biases +2.5,
  // +2.7, +1.9, +1.4, +1.8, +2.9 % give RMS bias 2.26 %. Results are built at target 100.
  test('Nordtest TR 537 ammonium: RMS of six PT biases is 2.26 % (second-hand)', () => {
    const biases = [2.5, 2.7, 1.9, 1.4, 1.8, 2.9];
    const rms = rmsPercentBias(biases.map((b) => 100 + b), biases.map(() => 100));
    expect(Math.abs(rms - 2.26)).toBeLessThan(0.005);
    // Exact value, common practice: √(30.76/6).
    expect(Math.abs(rms - Math.sqrt(30.76 / 6))).toBeLessThanOrEqual(1e-12);
  });

  test('if a target is zero, throws #DIV/0!', () => {
    expect(() => meanPercentBias([1, 2], [1, 0])).toThrow(expect.objectContaining({ code: '#DIV/0!' }));
    expect(() => rmsPercentBias([1], [0])).toThrow(expect.objectContaining({ code: '#DIV/0!' }));
  });

  test('if given no pairs, throws #NUM!; unequal lengths #VALUE!', () => {
    expect(() => meanPercentBias([], [])).toThrow(expect.objectContaining({ code: '#NUM!' }));
    expect(() => meanPercentBias([1, 2], [1])).toThrow(expect.objectContaining({ code: '#VALUE!' }));
  });

  // Seed 3002: RMS bias ≥ |mean bias| (RMS² = mean² + population variance).
  test('property: RMS bias ≥ |mean bias|, equal when every bias is the same', () => {
    const rand = mulberry32(3002);
    for (let i = 0; i < 500; i++) {
      const n = 1 + Math.floor(rand() * 20);
      const t = Array.from({ length: n }, () => uniform(rand, 0.5, 50));
      const r = t.map((x) => x * (1 + uniform(rand, -0.2, 0.2)));
      const m = meanPercentBias(r, t);
      const q = rmsPercentBias(r, t);
      expect(q).toBeGreaterThanOrEqual(Math.abs(m) * (1 - 1e-12));
    }
    const t = [2, 5, 10];
    expect(Math.abs(rmsPercentBias(t.map((x) => x * 1.05), t) - 5)).toBeLessThanOrEqual(1e-12);
    expect(Math.abs(meanPercentBias(t.map((x) => x * 1.05), t) - 5)).toBeLessThanOrEqual(1e-12);
  });
});
