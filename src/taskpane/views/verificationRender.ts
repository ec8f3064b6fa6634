/**
 * Verification view, the pure renders: the claims form of each material, the figures of each
 * material (precision, trueness, sigma), the comparison's figures and difference plot, and the
 * confirmation asked before replacing cells. Each takes what it shows and returns elements.
 */
import { h, field, uid, svgFromString } from '../dom';
import type { Child } from '../dom';
import { fmt } from '../format';
import { differencePlotSvg } from '../../charts/differencePlot';
import type { DifferencePlotInput } from '../../charts/differencePlot';
import { isError } from '../study/figures';
import type { Figure } from '../study/figures';
import type { MaterialFigures } from '../study/verification';
import type { Typed } from '../study/inputs';

/** The four figures typed per material. */
export interface MaterialTexts {
  claimR: string;
  claimWl: string;
  assigned: string;
  uAssigned: string;
}

export const EMPTY_TEXTS: MaterialTexts = { claimR: '', claimWl: '', assigned: '', uAssigned: '' };

/** A figure in words: rounded number, the text, or the error with its message. */
export function show(f: Figure | undefined, decimals = 2, unit = ''): string {
  if (f === undefined) return '—';
  if (isError(f)) return `${f.error} ${f.message}`;
  if (typeof f === 'number') return `${fmt(f, decimals)}${unit}`;
  return String(f);
}

const verdictClass = (f: Figure | undefined): string => (f === 'yes' ? 'yes' : f === 'no' ? 'no' : isError(f) ? 'error' : '');

function fact(label: string, value: string, cls = '', key = ''): Child[] {
  return [h('dt', {}, label), h('dd', { class: cls || null, 'data-key': key || null }, value)];
}

function range(f: ReadonlyMap<string, Figure>, lo: string, hi: string, unit: string): string {
  const a = f.get(lo);
  const b = f.get(hi);
  return isError(a) || isError(b) ? '' : ` (95 % CI ${show(a, 2)}–${show(b, 2)}${unit})`;
}

/** One material's figures, in the order of the study: precision, then trueness, then sigma. */
export function renderMaterial(m: MaterialFigures, index: number, use?: { label: string; onUse: () => void }): HTMLElement {
  const f = m.figures;
  const kids: Child[] = [
    ...fact('Results', `${show(f.get('results'), 0)} in ${show(f.get('groups'), 0)} runs; mean ${show(f.get('mean'), 3)}`),
    ...fact('Repeatability CV', `${show(f.get('rCv'))} %${range(f, 'rLow', 'rHigh', ' %')}`, '', 'rCv'),
    ...fact('Claim → limit', `${show(f.get('claimR'))} % → ${show(f.get('rLimit'))} %`, '', 'rLimit'),
    ...fact('Repeatability verified', show(f.get('rOk')), verdictClass(f.get('rOk')), 'rOk'),
    ...fact('Within-lab CV', `${show(f.get('wlCv'))} %${range(f, 'wlLow', 'wlHigh', ' %')}`, '', 'wlCv'),
    ...fact('Claim → limit', `${show(f.get('claimWl'))} % → ${show(f.get('wlLimit'))} %`, '', 'wlLimit'),
    ...fact('Within-lab verified', show(f.get('wlOk')), verdictClass(f.get('wlOk')), 'wlOk'),
  ];
  if (f.has('tOk')) {
    kids.push(
      ...fact('Bias', `${show(f.get('bias'), 3)} (${show(f.get('biasPct'))} %) against ${show(f.get('assigned'), 3)}`, '', 'biasPct'),
      ...fact('Verification interval', `${show(f.get('tLow'), 3)} to ${show(f.get('tHigh'), 3)}`),
      ...fact('Trueness verified', show(f.get('tOk')), verdictClass(f.get('tOk')), 'tOk'),
    );
  }
  if (f.has('sigma')) {
    kids.push(...fact('Sigma', `${show(f.get('sigma'))}${range(f, 'sigmaLow', 'sigmaHigh', '')}`, '', 'sigma'), ...fact('with bias', `${show(f.get('sigmaBias'))} % (u ${show(f.get('uBias'))} %)`));
  }
  let action: HTMLElement | null = null;
  if (use) {
    const button = h('button', { type: 'button', class: 'use-observed', id: `verify-use-${index}` }, use.label);
    button.addEventListener('click', use.onUse);
    action = h('div', { class: 'actions' }, button);
  }
  return h('section', { class: 'card material', 'data-material': m.name, 'aria-labelledby': `material-${index}` }, h('h3', { class: 'card-title', id: `material-${index}` }, m.name), h('dl', { class: 'facts' }, ...kids), action);
}

/** A text input for one typed figure, with its problem (if any) under it. */
function typedField(label: string, value: string, typed: Typed, onInput: (v: string) => void, onChange: () => void, id: string): HTMLElement {
  const input = h('input', { type: 'text', inputmode: 'decimal', autocomplete: 'off', id, value, 'aria-invalid': typed.kind === 'bad' ? 'true' : null });
  input.addEventListener('input', () => onInput(input.value));
  input.addEventListener('change', onChange);
  const box = field(label, input);
  if (typed.kind === 'bad') box.appendChild(h('p', { class: 'error', role: 'alert' }, typed.why));
  return box;
}

export interface ClaimsForm {
  readonly names: readonly string[];
  readonly texts: readonly MaterialTexts[];
  readonly typed: (text: string) => Typed;
  readonly onInput: (index: number, key: keyof MaterialTexts, value: string) => void;
  readonly onChange: () => void;
}

/** One fieldset per material: the claims, and the assigned value with its uncertainty. */
export function renderClaims(form: ClaimsForm): HTMLElement {
  const sets = form.names.map((name, i) => {
    const t = form.texts[i];
    const one = (key: keyof MaterialTexts, label: string): HTMLElement =>
      typedField(label, t[key], form.typed(t[key]), (v) => form.onInput(i, key, v), form.onChange, `verify-${key}-${i}`);
    return h(
      'fieldset',
      { class: 'claims', 'data-material': name },
      h('legend', {}, name),
      h('div', { class: 'pair' }, one('claimR', 'Repeatability claim %'), one('claimWl', 'Within-lab claim %')),
      h('div', { class: 'pair' }, one('assigned', 'Assigned value'), one('uAssigned', 'u(assigned)')),
    );
  });
  return h('div', { class: 'claims-form' }, h('p', { class: 'hint' }, 'Type each figure, or the cell that holds it (e.g. H2 or Claims!B3): the block written to the sheet then refers to that cell. Leave the assigned value blank to skip trueness.'), ...sets);
}

/** The figures of DATA.AGREEMENT as a list. */
export function renderAgreement(f: Record<string, Figure>, unit: string): HTMLElement {
  const both = (a: string, lo: string, hi: string): string => `${show(f[a], 3)}${unit}${isError(f[lo]) ? '' : ` (95 % CI ${show(f[lo], 3)} to ${show(f[hi], 3)})`}`;
  return h(
    'dl',
    { class: 'facts', id: 'agreement-facts' },
    ...fact('Pairs', show(f['Pairs'], 0), '', 'Pairs'),
    ...fact('Mean difference', both('Mean difference', 'Mean difference low', 'Mean difference high'), '', 'Mean difference'),
    ...fact('SD of differences', `${show(f['SD of differences'], 3)}${unit}`),
    ...fact('Lower limit', both('Lower limit', 'Lower limit low', 'Lower limit high'), '', 'Lower limit'),
    ...fact('Upper limit', both('Upper limit', 'Upper limit low', 'Upper limit high'), '', 'Upper limit'),
  );
}

/** The difference plot, or the reason it cannot be drawn. */
export function renderPlot(input: DifferencePlotInput | string): HTMLElement {
  if (typeof input === 'string') return h('p', { class: 'error', role: 'alert' }, input);
  const box = h('figure', { class: 'study-chart', id: 'agreement-plot' });
  box.appendChild(svgFromString(differencePlotSvg({ ...input, id: uid('agreement') })));
  return box;
}
