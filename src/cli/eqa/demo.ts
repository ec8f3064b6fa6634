/**
 * The demo workbook's EQA sheet input: the demo's invented EQA results (src/engine/demo) with an
 * invented scheme around them — sd_pt, the assigned values' uncertainty, round dates, the
 * scheme's limits where the demo table gives none — the laboratory's own uncertainty (from the
 * demo's uncertainty figures, for ζ), and an invented comparison round among seven fictional
 * analysers at fictional sites. Every value here is invented; the sheet says "DEMO — invented data".
 */
import type { DemoAnalyteData } from '../../engine/demo';
import { DEMO_SEED, reportedDecimals } from '../../engine/demo';
import { mulberry32, normalDeviates } from '../../engine/demo/random';
import type { EqaLimit } from '../../engine/eqaRounds';
import type { Paper } from '../document';
import type { EqaPeerRoundInput, EqaSheetInput, EqaSheetRecord } from './sheet';

/** What the demo knows of one analyte for its EQA sheet. */
export interface DemoEqaAnalyte {
  readonly data: DemoAnalyteData;
  readonly cvi: number;
  /** The demo table's fixed limit, when it has one. */
  readonly limitAbs: number | null;
  readonly limitPct: number | null;
  /** The demo's expanded uncertainty (k = 2), %, when computed. */
  readonly expandedPercent: number | undefined;
}

/** Standard uncertainty of the scheme's assigned values, % (the demo's u_ref; invented). */
export const DEMO_EQA_U_ASSIGNED = 0.6;

/** The invented scheme's limits (percent, or units and percent) for analytes the demo table gives no fixed limit. */
const SCHEME_LIMITS: Readonly<Record<string, EqaLimit>> = {
  Arvelin: { percent: 6 },
  Brontase: { percent: 12 },
  Dorvamide: { percent: 4 },
  Elostrin: { absolute: 1.5, percent: 12 },
  Galvorin: { percent: 20 },
  Hexolane: { percent: 12 },
  Irvastine: { percent: 12 },
  Jurapol: { percent: 15 },
  Morvenide: { absolute: 0.2, percent: 6 },
};

/** Three significant digits, half away from zero. */
function sig3(x: number): number {
  if (x === 0) return 0;
  const e = Math.floor(Math.log10(Math.abs(x))) - 2;
  return Number((Math.round(x / 10 ** e) * 10 ** e).toPrecision(3));
}

/** The invented scheme's sd_pt in percent of the assigned value: 1.5 % + a quarter of CVI. */
function sdPtPercent(cvi: number): number {
  return 1.5 + 0.25 * cvi;
}

function records(a: DemoEqaAnalyte): EqaSheetRecord[] {
  return a.data.eqa.map((x, i) => ({
    analyte: a.data.analyte,
    round: x.sample,
    result: x.result,
    assigned: x.target,
    sdPt: sig3((x.target * sdPtPercent(a.cvi)) / 100),
    uAssigned: sig3((x.target * DEMO_EQA_U_ASSIGNED) / 100),
    unit: a.data.unit,
    date: `2026-${String(i + 1).padStart(2, '0')}-12`,
    note: '',
    uResult: a.expandedPercent === undefined ? null : sig3((x.result * a.expandedPercent) / 2 / 100),
  }));
}

/** Seven fictional analysers (A–G; A and B are the demo's analysers) at fictional sites, with the share of bias each is invented to carry (%). */
const PEERS: ReadonlyArray<readonly [string, number]> = [
  ['A, main site', 0.4],
  ['B, main site (new)', 0.9],
  ['C, north site', -0.6],
  ['D, north site', 0.1],
  ['E, east clinic', -1.1],
  ['F, east clinic', 0.3],
  ['G, day unit', 0],
];
/** Analytes of the invented comparison round, and the far-off result (%) analyser G is invented to give. */
const PEER_ANALYTES: ReadonlyArray<readonly [string, number]> = [
  ['Arvelin', 0],
  ['Calpidine', 9],
  ['Kelvorin', -7],
];

function peerRounds(analytes: readonly DemoEqaAnalyte[]): EqaPeerRoundInput[] {
  const rand = mulberry32(DEMO_SEED + 13528);
  const z = normalDeviates(rand);
  return PEER_ANALYTES.map(([name, off]) => {
    const a = analytes.find((x) => x.data.analyte === name);
    if (!a) throw new Error(`the demo has no analyte ${name}`);
    const f = 10 ** reportedDecimals(a.data.level);
    const cv = 1.2;
    const results = PEERS.map(([peer, bias], k) => {
      const pct = bias + (k === PEERS.length - 1 ? off : 0) + cv * z();
      return { name: peer, result: Math.round(a.data.level * (1 + pct / 100) * f) / f };
    });
    return { analyte: name, round: 'IC-26-1 (inter-analyser)', unit: a.data.unit, results };
  });
}

/** The demo's EQA sheet input. */
export function demoEqaInput(analytes: readonly DemoEqaAnalyte[], options: { date: string; paper: Paper; intro: readonly string[] }): EqaSheetInput {
  const limits: Record<string, EqaLimit> = {};
  for (const a of analytes) {
    const own = a.limitAbs !== null || a.limitPct !== null ? { absolute: a.limitAbs, percent: a.limitPct } : SCHEME_LIMITS[a.data.analyte];
    if (own) limits[a.data.analyte] = own;
  }
  return {
    results: analytes.flatMap(records),
    limits,
    source: { kind: 'demo' },
    date: options.date,
    paper: options.paper,
    sheetName: 'EQA',
    pageTitle: 'Leeway demo — EQA',
    title: 'Leeway demo: external quality assessment across rounds — DEMO',
    intro: [
      ...options.intro,
      `Invented scheme: sd_pt = 1.5 % + CVI/4 of the assigned value, u(assigned) = ${DEMO_EQA_U_ASSIGNED} % of it; the laboratory's u(result) = half its expanded uncertainty (the Uncertainty sheet). EQA limits: the demo table's fixed limits, else the invented scheme's.`,
    ],
    peerRounds: peerRounds(analytes),
  };
}
