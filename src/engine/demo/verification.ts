/**
 * The demo's verification study (invented): before the new, fictional analyser B reports patient
 * results, the fictional laboratory checks the manufacturer's precision claims on two control
 * materials for three of the demo analytes — 5 days × 5 replicates per material (the CLSI EP15-A3
 * design) — and, on the material that comes with an assigned value, its trueness.
 *
 * Every claim, assigned value, material and result below is invented for the demo; none is taken
 * from any publication, laboratory, product or person. Every output that uses them says
 * "DEMO — invented data, not for clinical use".
 *
 * The results are drawn from a fixed seed (VERIFICATION_SEED). The design is chosen so the study
 * reads clearly: one material (Brontase, Level 1) has a large day-to-day effect that its
 * within-lab claim does not allow, so its within-lab precision is not verified; every other claim
 * is consistent with the study.
 */
import { mulberry32, normalDeviates } from './random';
import { REPLICATES_PER_DAY, REPLICATION_DAYS, reportedDecimals } from './scenario';
import type { ReplicateResult } from './scenario';

export const VERIFICATION_SEED = 20260122;

/** The number of materials verified in the same study of one analyte (`samples` of VERIFY.PRECISION). */
export const VERIFICATION_MATERIALS = 2;

/** An invented manufacturer's claim for one material, percent CVs. */
export interface PrecisionClaim {
  readonly repeatability: number;
  readonly withinLab: number;
}

/** An invented assigned value and its standard uncertainty, in the unit of the results. */
export interface AssignedValue {
  readonly value: number;
  readonly u: number;
}

export interface VerificationMaterial {
  /** "Level 1", "Level 2". */
  readonly material: string;
  /** The concentration the material is made at (its nominal level). */
  readonly level: number;
  readonly claim: PrecisionClaim;
  /** Present on the material that carries an assigned value (the trueness block). */
  readonly assigned?: AssignedValue;
  readonly replication: readonly ReplicateResult[];
}

export interface VerificationAnalyte {
  readonly analyte: string;
  readonly unit: string;
  readonly materials: readonly VerificationMaterial[];
}

/** What the demo invents per material: claim, assigned value, and the true performance the results are drawn from. */
interface MaterialDesign {
  readonly material: string;
  readonly level: number;
  readonly claim: PrecisionClaim;
  readonly assigned?: AssignedValue;
  /** True repeatability CV, %. */
  readonly cvRepeat: number;
  /** True between-day CV, %. */
  readonly cvDay: number;
  /** True bias of analyser B on this material, % of its level (the assigned value when there is one). */
  readonly bias: number;
}

interface AnalyteDesign {
  readonly analyte: string;
  readonly unit: string;
  readonly materials: readonly MaterialDesign[];
}

// Analytes and units are those of the demo table (scenario.ts); levels, claims and assigned values invented.
const DESIGNS: readonly AnalyteDesign[] = [
  {
    analyte: 'Arvelin',
    unit: 'mmol/L',
    materials: [
      { material: 'Level 1', level: 3.1, claim: { repeatability: 1.5, withinLab: 2.2 }, cvRepeat: 1.2, cvDay: 0.8, bias: 0.4 },
      { material: 'Level 2', level: 7.9, claim: { repeatability: 1.1, withinLab: 1.6 }, assigned: { value: 7.9, u: 0.05 }, cvRepeat: 0.9, cvDay: 0.6, bias: 0.5 },
    ],
  },
  {
    analyte: 'Brontase',
    unit: 'U/L',
    materials: [
      // The clear "no": a day-to-day effect well beyond what the within-lab claim allows.
      { material: 'Level 1', level: 28, claim: { repeatability: 2.8, withinLab: 3.6 }, cvRepeat: 2.4, cvDay: 10, bias: -1.0 },
      { material: 'Level 2', level: 96, claim: { repeatability: 1.9, withinLab: 2.7 }, assigned: { value: 96.0, u: 0.9 }, cvRepeat: 1.6, cvDay: 1.0, bias: -0.8 },
    ],
  },
  {
    analyte: 'Calpidine',
    unit: 'µmol/L',
    materials: [
      { material: 'Level 1', level: 62, claim: { repeatability: 2.6, withinLab: 3.4 }, cvRepeat: 2.1, cvDay: 1.4, bias: 1.2 },
      { material: 'Level 2', level: 205, claim: { repeatability: 1.8, withinLab: 2.5 }, assigned: { value: 205.0, u: 1.6 }, cvRepeat: 1.5, cvDay: 0.9, bias: 0.9 },
    ],
  },
];

/** The demo's verification study: three invented analytes × two materials, 5 days × 5 replicates each (deterministic: VERIFICATION_SEED). */
export function demoVerification(): VerificationAnalyte[] {
  const rand = mulberry32(VERIFICATION_SEED);
  const z = normalDeviates(rand);
  return DESIGNS.map((a) => ({
    analyte: a.analyte,
    unit: a.unit,
    materials: a.materials.map((m) => {
      const f = 10 ** reportedDecimals(m.level);
      const round = (x: number): number => Math.round(x * f) / f;
      const centre = (m.assigned?.value ?? m.level) * (1 + m.bias / 100);
      const sdRepeat = (m.cvRepeat / 100) * m.level;
      const sdDay = (m.cvDay / 100) * m.level;
      const replication: ReplicateResult[] = [];
      for (let day = 1; day <= REPLICATION_DAYS; day++) {
        const shift = sdDay * z();
        for (let k = 0; k < REPLICATES_PER_DAY; k++) replication.push({ day: `Day ${day}`, result: round(centre + shift + sdRepeat * z()) });
      }
      return { material: m.material, level: m.level, claim: m.claim, ...(m.assigned ? { assigned: m.assigned } : {}), replication };
    }),
  }));
}
