/**
 * The invented demo scenario: a fictional regional laboratory brings a second,
 * fictional chemistry analyser into service. Every name, value and source below is invented for
 * the demo; none is taken from any publication, laboratory, product or person. Every output that
 * uses it says "DEMO — invented data, not for clinical use".
 *
 * Raw data are generated from a fixed seed (DEMO_SEED), so they are the same on every machine:
 * a 5-day × 5-replicate precision run at one level (the CLSI EP15-A3 design), 10 external
 * quality-assessment samples with their assigned values, and 40 patient samples measured on both
 * analysers (x = the analyser in service, y = the new one).
 */
import type { VariationRow, VariationTable } from '../table/types';
import { mulberry32, normalDeviates } from './random';

export const DEMO_SEED = 20260115;

export const DEMO_LAB = 'Lindenmoor Regional Laboratory (fictional)';

export const DEMO_ANALYSERS = {
  current: 'Analyser A (in service; fictional)',
  candidate: 'Analyser B (new; fictional)',
} as const;

export const DEMO_SOURCE = 'DEMO — invented values, not from any publication (2026-01)';

/** What the demo invents per analyte: table values, and the true performance the raw data are drawn from. */
interface Design {
  readonly analyte: string;
  readonly specimen: string;
  readonly unit: string;
  readonly cvi: number;
  readonly cvg: number;
  /** Concentration of the precision material and centre of the other data. */
  readonly level: number;
  /** True within-laboratory CV of analyser B, %. */
  readonly cv: number;
  /** True proportional bias of analyser B against the assigned values, %. */
  readonly bias: number;
  readonly limitAbs?: number;
  readonly limitPct?: number;
  readonly note?: string;
}

const DESIGNS: readonly Design[] = [
  { analyte: 'Arvelin', specimen: 'serum', unit: 'mmol/L', cvi: 5.1, cvg: 7.3, level: 5.2, cv: 1.1, bias: 0.8 },
  { analyte: 'Brontase', specimen: 'serum', unit: 'U/L', cvi: 9.8, cvg: 20.4, level: 42, cv: 2.6, bias: -2.1 },
  { analyte: 'Calpidine', specimen: 'plasma', unit: 'µmol/L', cvi: 4.4, cvg: 13.6, level: 88, cv: 2.9, bias: 2.4, limitAbs: 9, limitPct: 10, note: 'fixed limit from an invented EQA scheme' },
  { analyte: 'Dorvamide', specimen: 'serum', unit: 'g/L', cvi: 2.6, cvg: 4.9, level: 41, cv: 1.4, bias: 0.6 },
  { analyte: 'Elostrin', specimen: 'serum', unit: 'nmol/L', cvi: 14.2, cvg: 31.8, level: 17.5, cv: 4.1, bias: 3.2 },
  { analyte: 'Fenquilate', specimen: 'plasma', unit: 'mmol/L', cvi: 0.9, cvg: 1.6, level: 139, cv: 0.8, bias: 0.4, limitAbs: 4, note: 'tight within-subject variation (invented)' },
  { analyte: 'Galvorin', specimen: 'serum', unit: 'mg/L', cvi: 21.5, cvg: 58.0, level: 6.4, cv: 3.8, bias: -4.6 },
  { analyte: 'Hexolane', specimen: 'urine', unit: 'mmol/L', cvi: 24.0, cvg: 36.5, level: 11.8, cv: 2.2, bias: 1.5 },
  { analyte: 'Irvastine', specimen: 'serum', unit: 'U/L', cvi: 7.7, cvg: 16.2, level: 118, cv: 5.4, bias: 6.1 },
  { analyte: 'Jurapol', specimen: 'plasma', unit: 'pmol/L', cvi: 11.3, cvg: 27.1, level: 63, cv: 3.1, bias: -1.2 },
  { analyte: 'Kelvorin', specimen: 'serum', unit: 'µmol/L', cvi: 6.0, cvg: 9.4, level: 310, cv: 1.9, bias: 1.1, limitPct: 8 },
  { analyte: 'Morvenide', specimen: 'serum', unit: 'mmol/L', cvi: 3.3, cvg: 8.8, level: 2.35, cv: 2.4, bias: -3.0 },
];

/** The demo variation table: twelve invented analytes, always marked as demo data. */
export function demoTable(): VariationTable {
  const rows: VariationRow[] = DESIGNS.map((d, i) => ({
    analyte: d.analyte,
    specimen: d.specimen,
    unit: d.unit,
    cvi: d.cvi,
    cvg: d.cvg,
    source: DEMO_SOURCE,
    limitAbs: d.limitAbs ?? null,
    limitPct: d.limitPct ?? null,
    level: d.limitAbs !== undefined || d.limitPct !== undefined ? d.level : null,
    note: d.note ?? '',
    line: i + 2,
  }));
  return { name: 'Demo chemistry (invented)', origin: 'built-in demo table', importedAt: '2026-01-15T00:00:00.000Z', demo: true, rows };
}

export interface ReplicateResult {
  readonly day: string;
  readonly result: number;
}

export interface EqaResult {
  readonly sample: string;
  readonly target: number;
  readonly result: number;
}

export interface PairedResult {
  readonly sample: string;
  /** Analyser A (in service). */
  readonly x: number;
  /** Analyser B (new). */
  readonly y: number;
}

export interface DemoAnalyteData {
  readonly analyte: string;
  readonly specimen: string;
  readonly unit: string;
  /** Concentration of the precision material; the level at which bias is judged. */
  readonly level: number;
  readonly replication: readonly ReplicateResult[];
  readonly eqa: readonly EqaResult[];
  readonly comparison: readonly PairedResult[];
}

export const REPLICATION_DAYS = 5;
export const REPLICATES_PER_DAY = 5;
export const EQA_SAMPLES = 10;
export const COMPARISON_SAMPLES = 40;

/** Decimals the invented analysers report at a level (about three significant digits). */
export function reportedDecimals(level: number): number {
  if (level < 1) return 3;
  if (level < 10) return 2;
  if (level < 1000) return 1;
  return 0;
}

function rounder(level: number): (x: number) => number {
  const f = 10 ** reportedDecimals(level);
  return (x) => Math.round(x * f) / f;
}

/** The invented raw data of every demo analyte (deterministic: DEMO_SEED). */
export function demoData(): DemoAnalyteData[] {
  const rand = mulberry32(DEMO_SEED);
  const z = normalDeviates(rand);
  return DESIGNS.map((d) => {
    const round = rounder(d.level);
    const sd = (d.cv / 100) * d.level;
    // Within-lab variance split 0.75 within-run, 0.25 between-day.
    const sdRun = sd * Math.sqrt(0.75);
    const sdDay = sd * Math.sqrt(0.25);
    const replication: ReplicateResult[] = [];
    for (let day = 1; day <= REPLICATION_DAYS; day++) {
      const dayShift = sdDay * z();
      for (let k = 0; k < REPLICATES_PER_DAY; k++) {
        replication.push({ day: `Day ${day}`, result: round(d.level * (1 + d.bias / 100) + dayShift + sdRun * z()) });
      }
    }
    const eqa: EqaResult[] = [];
    for (let i = 1; i <= EQA_SAMPLES; i++) {
      const target = round(d.level * (0.6 + (1.0 * (i - 1)) / (EQA_SAMPLES - 1)));
      const result = round(target * (1 + d.bias / 100) + (d.cv / 100) * target * z());
      eqa.push({ sample: `EQA-26-${String(i).padStart(2, '0')}`, target, result });
    }
    const comparison: PairedResult[] = [];
    for (let i = 1; i <= COMPARISON_SAMPLES; i++) {
      const truth = d.level * Math.exp(Math.log(0.3) + Math.log(2.2 / 0.3) * rand());
      const x = round(truth * (1 + (d.cv / 100) * 0.9 * z()));
      const y = round(truth * (1 + d.bias / 100) * (1 + (d.cv / 100) * z()));
      comparison.push({ sample: `P${String(i).padStart(3, '0')}`, x, y });
    }
    return { analyte: d.analyte, specimen: d.specimen, unit: d.unit, level: d.level, replication, eqa, comparison };
  });
}
