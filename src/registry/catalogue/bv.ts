/** BV family: other uses of biological variation. */
import { individualityIndex, logNormalRcv, readDirection, referenceChangeValue, setPointSpecimens } from '../../engine/bv';
import { elementwise, num, optNum, optWord } from '../define';
import { Z_95 } from '../params';

const CV_A = num('cv', 'Analytical CV, %.');
const CVI = num('cvi', 'Within-subject biological variation CVI, %.');

export const BV_RCV = elementwise({
  name: 'BV.RCV',
  doc: {
    summary: 'reference change value √2·z·√(CV² + CVI²)',
    description: 'Reference change value: √2 × z × √(CV² + CVI²), z = 1.96 by default (two-sided 95 %). Percent.',
    sources: ['Harris EK, Yasaka T. Clin Chem 1983;29:25–30'],
    returns: 'RCV, %.',
    example: { args: [2.5, 5.7] },
  },
  params: [CV_A, CVI, Z_95],
  fn: referenceChangeValue,
});

export const BV_RCVLOG = elementwise({
  name: 'BV.RCVLOG',
  doc: {
    summary: 'log-normal RCV, a rise ("up", default) or a fall ("down"); percent inputs only',
    description:
      'Log-normal (asymmetric) RCV: σ = √ln(1 + (√(CV² + CVI²)/100)²); up = (e^(z√2σ) − 1) × 100, down = (e^(−z√2σ) − 1) × 100. Not linear: inputs must be percent. z = 1.96 by default.',
    sources: ['Fokkema MR, et al. Clin Chem 2006;52:1602–3'],
    returns: 'RCV, % (negative for "down").',
    example: { args: [2.5, 5.7, 1.96, 'down'] },
  },
  params: [CV_A, CVI, Z_95, optWord('direction', readDirection, 'up', '"up" (default) or "down".')],
  fn: logNormalRcv,
});

export const BV_INDIVIDUALITY = elementwise({
  name: 'BV.INDIVIDUALITY',
  doc: {
    summary: 'index of individuality √(CVI² + CV²)/CVG',
    description:
      'Index of individuality: √(CVI² + CV²) / CVG, CV defaults to 0. Below about 0.6, population reference intervals say little about one person.',
    sources: ['Harris EK. Clin Chem 1974;20:1535–42'],
    returns: 'Index of individuality.',
    example: { args: [5.7, 6.9] },
  },
  params: [CVI, num('cvg', 'Between-subject biological variation CVG, %; > 0.'), optNum('cv', 0, 'Analytical CV, %, default 0.')],
  fn: individualityIndex,
});

export const BV_SETPOINT = elementwise({
  name: 'BV.SETPOINT',
  doc: {
    summary: 'specimens needed to estimate a set point within ± closeness %',
    description:
      'Specimens needed to estimate a person\'s set point within ± closeness %: ⌈(z × √(CV² + CVI²) / closeness)²⌉, at least 1; a square within 1e-12 of a whole number counts as that number (binary rounding does not add a specimen). z = 1.96 by default.',
    sources: ['Harris EK. Clin Chem 1974;20:1535–42'],
    returns: 'Number of specimens.',
    example: { args: [2.5, 5.7, 5] },
  },
  params: [CV_A, CVI, num('closeness', 'Closeness to the set point, %; > 0.'), Z_95],
  fn: setPointSpecimens,
});

export const BV_FUNCTIONS = [BV_RCV, BV_RCVLOG, BV_INDIVIDUALITY, BV_SETPOINT];
