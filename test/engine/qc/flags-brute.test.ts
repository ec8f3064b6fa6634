/**
 * QC.FLAGS against an independent brute-force evaluator written here from the published rule
 * definitions (Westgard JO, Barry PL, Hunt MR, Groth T. Clin Chem 1981;27:493–501) as the
 * catalogue applies them to a period of results. It shares no code with the engine: it reads
 * the rule text with its own patterns, builds each sequence as a plain list, and for every
 * result and term re-scans the window that ends at the result. Seeded random series (mulberry32)
 * with several materials, runs written in varied spellings, rows in run order, sorted by
 * material or shuffled, blanks and text.
 */
import { controlFlags, Entry, Label } from '../../../src/engine/qc/flags';
import { parseRule } from '../../../src/engine/qc/rules';
import { mulberry32 } from '../../support/prng';

type Check = (z: number[], seqs: number[][], i: number, runMates: number[]) => boolean;

/** One term of the rule text, by this file's own patterns. */
function check(term: string): Check {
  let m: RegExpExecArray | null;
  if ((m = /^1-([\d.]+)s$/.exec(term))) {
    const L = Number(m[1]);
    return (z, _s, i) => Math.abs(z[i]) > L;
  }
  if ((m = /^(\d+)-([\d.]+)s$/.exec(term))) {
    // k consecutive results, all above +L or all below −L, ending at this result.
    const k = Number(m[1]);
    const L = Number(m[2]);
    return (z, seqs, i) =>
      seqs.some((seq) => {
        const p = seq.indexOf(i);
        if (p < k - 1) return false;
        const w = seq.slice(p - k + 1, p + 1).map((j) => z[j]);
        return w.every((x) => x > L) || w.every((x) => x < -L);
      });
  }
  if ((m = /^(\d+)-x$/.exec(term))) {
    // k consecutive results on the same side of the mean, ending at this result.
    const k = Number(m[1]);
    return (z, seqs, i) =>
      seqs.some((seq) => {
        const p = seq.indexOf(i);
        if (p < k - 1) return false;
        const w = seq.slice(p - k + 1, p + 1).map((j) => z[j]);
        return w.every((x) => x > 0) || w.every((x) => x < 0);
      });
  }
  if ((m = /^(\d+)of(\d+)-([\d.]+)s$/.exec(term))) {
    // This result beyond a limit, and a of the b results ending here beyond the same limit.
    const a = Number(m[1]);
    const b = Number(m[2]);
    const L = Number(m[3]);
    return (z, seqs, i) =>
      seqs.some((seq) => {
        const p = seq.indexOf(i);
        const w = seq.slice(Math.max(0, p - b + 1), p + 1).map((j) => z[j]);
        if (z[i] > L) return w.filter((x) => x > L).length >= a;
        if (z[i] < -L) return w.filter((x) => x < -L).length >= a;
        return false;
      });
  }
  if ((m = /^R-([\d.]+)s$/.exec(term))) {
    // Within the run: highest minus lowest > L, on the run's last result in the range's order.
    const L = Number(m[1]);
    return (z, _s, i, mates) => {
      if (mates.length < 2 || i !== Math.max(...mates)) return false;
      const zs = mates.map((j) => z[j]);
      return Math.max(...zs) - Math.min(...zs) > L;
    };
  }
  throw new Error(`unknown term ${term}`);
}

function key(v: Label): string {
  return typeof v === 'string' ? v.trim().toLowerCase() : String(v);
}

interface Series {
  values: Entry[];
  target: Entry[];
  sd: Entry[];
  rule: string;
  runs?: Label[];
  levels?: Label[];
}

function bruteFlags(s: Series): string[] {
  const n = s.values.length;
  const numeric = (i: number): boolean => typeof s.values[i] === 'number';
  const z = s.values.map((v, i) => (typeof v === 'number' ? (v - (s.target[i] as number)) / (s.sd[i] as number) : NaN));
  const runOf = (i: number): string => (s.runs ? key(s.runs[i]) : `row ${i}`);
  const levelOf = (i: number): string => (s.levels ? key(s.levels[i]) : 'one');
  const runOrder: string[] = [];
  for (let i = 0; i < n; i++) {
    if (s.runs && (s.runs[i] === null || s.runs[i] === undefined || key(s.runs[i]) === '')) continue;
    if (!runOrder.includes(runOf(i))) runOrder.push(runOf(i));
  }
  const all: number[] = [];
  for (const r of runOrder) for (let i = 0; i < n; i++) if (numeric(i) && runOf(i) === r) all.push(i);
  const terms = s.rule.split('/');
  const checks = terms.map(check);
  return s.values.map((_v, i) => {
    if (!numeric(i)) return '';
    const own = all.filter((j) => levelOf(j) === levelOf(i));
    const mates = all.filter((j) => runOf(j) === runOf(i));
    return terms.filter((_t, k) => checks[k](z, [own, all], i, mates)).join('/');
  });
}

const POOL = [
  '1-2s', '1-2.5s', '1-3s', '1-3.5s', '2-2s', '2-2.5s', '3-1s', '4-1s', '3-1.5s',
  'R-4s', 'R-3s', 'R-2.5s', '10-x', '6-x', '8-x', '12-x', '2of3-2s', '2of3-1.5s', '3of6-1s',
];

function randomSeries(rand: () => number): Series {
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)];
  const materials = 1 + Math.floor(rand() * 3);
  const runCount = 2 + Math.floor(rand() * 24);
  const maxPerRun = 1 + Math.floor(rand() * 3);
  // Each material drifts in and out of a shift so that count rules fire often.
  const shift = Array.from({ length: materials }, () => 0);
  type Row = { run: number; level: number; z: number };
  const rows: Row[] = [];
  for (let r = 0; r < runCount; r++) {
    for (let m = 0; m < materials; m++) {
      if (rand() < 0.15) shift[m] = pick([0, 0, 1.2, -1.2, 2.2, -2.2]);
      const count = Math.floor(rand() * (maxPerRun + 1));
      for (let c = 0; c < count; c++) {
        const u = Math.max(rand(), 1e-12);
        const g = Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
        rows.push({ run: r, level: m, z: shift[m] + 1.2 * g });
      }
    }
  }
  const layout = rand();
  if (layout < 0.35) rows.sort((a, b) => a.level - b.level || a.run - b.run);
  else if (layout < 0.55) {
    for (let i = rows.length - 1; i > 0; i--) {
      const j = Math.floor(rand() * (i + 1));
      [rows[i], rows[j]] = [rows[j], rows[i]];
    }
  }
  const spellRun = (r: number): Label => pick<Label>([r + 1, String(r + 1), ` ${r + 1} `, `Run ${r + 1}`.toUpperCase(), `run ${r + 1}`]);
  const values: Entry[] = [];
  const target: Entry[] = [];
  const sd: Entry[] = [];
  const runs: Label[] = [];
  const levels: Label[] = [];
  const runSpelling = new Map<number, 'number' | 'text'>();
  for (const row of rows) {
    const t = 1 + 200 * rand();
    const s = 0.05 + 5 * rand();
    const blank = rand();
    values.push(blank < 0.07 ? null : blank < 0.1 ? 'no result' : t + row.z * s);
    target.push(t);
    sd.push(s);
    // A run keeps one family of spellings (number-like or "run N"), varied in case and spaces.
    let family = runSpelling.get(row.run);
    if (!family) {
      family = rand() < 0.5 ? 'number' : 'text';
      runSpelling.set(row.run, family);
    }
    let label = spellRun(row.run);
    while ((typeof label === 'string' && /run/i.test(label)) !== (family === 'text')) label = spellRun(row.run);
    runs.push(label);
    levels.push(pick([`Level ${row.level + 1}`, ` level ${row.level + 1}`, `LEVEL ${row.level + 1} `]));
  }
  const terms: string[] = [];
  const termCount = 1 + Math.floor(rand() * 5);
  while (terms.length < termCount) {
    const t = pick(POOL);
    if (!terms.includes(t)) terms.push(t);
  }
  return {
    values,
    target,
    sd,
    rule: terms.join('/'),
    runs: rand() < 0.8 ? runs : undefined,
    levels: rand() < 0.75 ? levels : undefined,
  };
}

describe('QC.FLAGS equals a brute-force re-scan of the published definitions', () => {
  test('3000 seeded random series (seed 19810493): identical flags for every result', () => {
    const rand = mulberry32(19810493);
    let fired = 0;
    let multi = 0;
    const seen = new Set<string>();
    for (let k = 0; k < 3000; k++) {
      const s = randomSeries(rand);
      const engine = controlFlags({ ...s, rule: parseRule(s.rule) });
      const brute = bruteFlags(s);
      if (JSON.stringify(engine) !== JSON.stringify(brute)) {
        // Show the failing case in full.
        expect({ case: k, series: s, engine }).toEqual({ case: k, series: s, engine: brute });
      }
      for (const f of brute) {
        if (f) fired++;
        if (f.includes('/')) multi++;
        for (const t of f.split('/')) if (t) seen.add(t);
      }
    }
    // The cases exercise the rules: many flags, results completing several terms, every term.
    expect(fired).toBeGreaterThan(5000);
    expect(multi).toBeGreaterThan(300);
    expect([...seen].sort()).toEqual([...POOL].sort());
  });
});
