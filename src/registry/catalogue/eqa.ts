/** EQA family: external quality assessment scores and a robust consensus (ISO 13528:2015). */
import { consensus, eqaZeta, eqaZScore } from '../../engine/eqa';
import { elementwise, labelled, num, optNum, range } from '../define';
import { numbersOf } from '../coerce';
import type { Grid } from '../types';

const ISO_13528 = 'ISO 13528:2015';
const BANDS = '|score| ≤ 2 satisfactory, 2 < |score| < 3 questionable, |score| ≥ 3 unsatisfactory (ISO 13528\'s action signal at 3.0).';
const RESULT = num('result', 'The laboratory\'s result for the EQA sample.');
const ASSIGNED = num('assigned', 'The assigned value, same unit.');

export const EQA_ZSCORE = elementwise({
  name: 'EQA.ZSCORE',
  doc: {
    summary: 'z score (result − assigned)/sd_pt, or z′ with the assigned value\'s uncertainty',
    description:
      'z = (result − assigned)/sd_pt; with u_assigned > 0, z′ = (result − assigned)/√(sd_pt² + u_assigned²) (use z′ when the assigned value\'s uncertainty is not negligible, u_assigned ≥ 0.3·sd_pt). sd_pt > 0 (0 gives #DIV/0!), u_assigned ≥ 0. ' + BANDS,
    sources: [ISO_13528],
    returns: 'z (or z′).',
    example: { args: [5.4, 5.0, 0.25] },
  },
  params: [RESULT, ASSIGNED, num('sd_pt', 'Standard deviation for proficiency assessment set by the scheme, same unit; > 0.'), optNum('u_assigned', 0, 'Standard uncertainty of the assigned value, same unit; ≥ 0; default 0 (plain z).')],
  fn: eqaZScore,
});

export const EQA_ZETA = elementwise({
  name: 'EQA.ZETA',
  doc: {
    summary: 'ζ score (result − assigned)/√(u_result² + u_assigned²)',
    description:
      'ζ = (result − assigned)/√(u_result² + u_assigned²): the deviation judged against the laboratory\'s own standard uncertainty and the assigned value\'s. u ≥ 0; both zero gives #DIV/0!. ' + BANDS,
    sources: [ISO_13528],
    returns: 'ζ.',
    example: { args: [5.4, 5.0, 0.15, 0.05] },
  },
  params: [RESULT, ASSIGNED, num('u_result', 'The laboratory\'s standard uncertainty of its result, same unit; ≥ 0.'), num('u_assigned', 'Standard uncertainty of the assigned value, same unit; ≥ 0.')],
  fn: eqaZeta,
});

export const EQA_CONSENSUS = labelled({
  name: 'EQA.CONSENSUS',
  doc: {
    summary: 'robust mean and SD of participants\' results (Algorithm A)',
    description:
      'ISO 13528 Algorithm A on at least 3 numbers (text and blanks ignored): start at the median and 1.483·median|xᵢ − x*|; then repeatedly clip every result into x* ± 1.5·s*, take x* = mean and s* = 1.134·SD (n − 1) of the clipped values, until both change by less than 1e-12 of s* (at most 1,000 rounds, else #NUM!). When the first s* is 0 the result is the median and 0. Uncertainty of the assigned value = 1.25·s*/√p.',
    sources: [`${ISO_13528}, annex C (Algorithm A)`],
    returns: 'Labelled robust mean, robust SD, number of participants and the uncertainty of the assigned value.',
    notes: ['With a quarter or more of the results far off, Algorithm A may settle at the plain mean: look at the results before using the consensus as an assigned value.'],
    example: { args: [[[5.02], [4.97], [5.10], [5.05], [4.99], [5.61], [5.03], [4.95]]], show: ['Robust mean', 'Robust SD', 'Participants'] },
  },
  params: [range('values', 'The participants\' results (one per laboratory or analyser).')],
  labels: ['Robust mean', 'Robust SD', 'Participants', 'Uncertainty of the assigned value'],
  fn: (g: Grid) => {
    const c = consensus(numbersOf(g));
    return { 'Robust mean': c.robustMean, 'Robust SD': c.robustSd, Participants: c.participants, 'Uncertainty of the assigned value': c.uncertainty };
  },
});

export const EQA_FUNCTIONS = [EQA_ZSCORE, EQA_ZETA, EQA_CONSENSUS];
