/**
 * The Fill view's tier for the whole sheet and the coverage (a z, or a probability turned into z
 * by ZSCORE's own code). Changes go to the pane's state, which notifies the other views.
 */
import { h, replace, field, radioGroup } from '../../dom';
import type { PaneContext } from '../../view';
import { zOf, sheetTierWords } from '../../state';
import type { CoverageMode } from '../../state';
import { fmt, tierLabel } from '../../format';
import { readDecimal } from '../../../engine/table';
import { TIERS } from '../../../engine/tiers';

export function tiersPart(ctx: PaneContext, invalidate: () => void): { root: HTMLElement; render(): void } {
  const { state } = ctx;
  const root = h('div', { class: 'choose' });
  const zOut = h('output', { id: 'z-used', class: 'z-used' });
  const coverageInput = h('input', { type: 'text', inputmode: 'decimal', id: 'coverage-value', autocomplete: 'off' });
  const sidesSelect = h('select', { id: 'coverage-sides' }, h('option', { value: '1' }, 'one-sided'), h('option', { value: '2' }, 'two-sided'));
  const sidesField = field('Sides', sidesSelect);
  const coverageField = field('Coverage', coverageInput);
  const coverageLabel = coverageField.querySelector('label') as HTMLLabelElement;
  const origin = h('p', { class: 'hint tier-origin', id: 'fill-tier-origin' });

  function showZ(): void {
    const q = zOf(state.coverage);
    zOut.className = `z-used ${q.ok ? '' : 'error'}`;
    zOut.textContent = q.ok ? `z used: ${fmt(q.z, 4)}` : q.why;
    coverageInput.setAttribute('aria-invalid', q.ok ? 'false' : 'true');
  }

  function syncCoverage(): void {
    const c = state.coverage;
    coverageLabel.textContent = c.mode === 'z' ? 'z (coverage factor)' : 'Probability (0–1)';
    coverageInput.value = String(c.mode === 'z' ? c.z : c.probability);
    sidesSelect.value = String(c.sides);
    sidesField.hidden = c.mode === 'z';
    showZ();
  }

  coverageInput.addEventListener('input', () => {
    const x = readDecimal(coverageInput.value);
    const v = x === undefined ? NaN : x;
    invalidate();
    state.setCoverage(state.coverage.mode === 'z' ? { ...state.coverage, z: v } : { ...state.coverage, probability: v });
    showZ();
  });
  sidesSelect.addEventListener('change', () => {
    invalidate();
    state.setCoverage({ ...state.coverage, sides: sidesSelect.value === '2' ? 2 : 1 });
    showZ();
  });

  function render(): void {
    const modes = [
      { value: 'z' as CoverageMode, label: 'z' },
      { value: 'probability' as CoverageMode, label: 'probability' },
    ];
    origin.textContent = `Now ${tierLabel(state.sheetTier)}, from ${sheetTierWords(state.sheetTierOrigin)}.`;
    replace(
      root,
      h('h2', {}, 'Tier and coverage'),
      radioGroup('Tier for the whole sheet', 'sheet-tier', TIERS.map((t) => ({ value: t, label: tierLabel(t) })), state.sheetTier, (t) => {
        invalidate();
        state.setSheetTier(t);
        origin.textContent = `Now ${tierLabel(state.sheetTier)}, from ${sheetTierWords(state.sheetTierOrigin)}.`;
      }),
      origin,
      radioGroup('Coverage given as', 'coverage-mode', modes, state.coverage.mode, (m) => {
        invalidate();
        state.setCoverage({ ...state.coverage, mode: m });
        syncCoverage();
      }),
      h('div', { class: 'pair' }, coverageField, sidesField),
      zOut,
      h('p', { class: 'hint' }, 'A probability is turned into z with the same code as LEEWAY.ZSCORE (0.95 one-sided gives 1.645). The total-error model’s usual z is 1.65.'),
    );
    syncCoverage();
  }
  return { root, render };
}
