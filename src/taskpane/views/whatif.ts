/**
 * What-if view: for one analyte, the three tiers side by side (allowable CV, bias, total error)
 * from the engine; with observed bias and CV (typed, or read from the active row) the observed
 * total error, sigma and share of each tier's allowance, and the most stringent tier met, with a
 * small chart of observed error against each allowance. Below: the same figures for every picked
 * analyte at once, and the control that changes the tier cell of a filled sheet.
 */
import { h, replace, field, radioGroup, uid } from '../dom';
import type { PaneContext, View } from '../view';
import type { VariationRow } from '../../engine/table';
import { readDecimal } from '../../engine/table';
import { TIERS } from '../../engine/tiers';
import type { Tier } from '../../engine/tiers';
import { whatIf } from '../whatif';
import type { WhatIfResult } from '../whatif';
import { zOf } from '../state';
import { keyOf, displayName, attrKey } from '../analytes';
import { fmt, showFigure, tierLabel } from '../format';
import { allowanceChart } from '../charts';
import { readActiveRow, readAllRows, findTierCell } from '../sheetRows';
import { readTier } from '../../engine/tiers';
import { DEMO_MARKER } from '../../engine/caution';
import { TIER_CELL_LABEL } from '../../engine/fill';
import { explain, parseLeewayCall, referencesOf, refKey } from '../explain';
import type { Grid } from '../../registry/types';
import { demoObserved } from '../demo';

function inputOf(r: VariationRow, z: number, obs: { bias: number; cv: number } | null) {
  return { cvi: r.cvi, cvg: r.cvg, z, observed: obs, limits: r };
}

export function whatIfView(ctx: PaneContext): View {
  const { state } = ctx;
  const root = h('div', { class: 'view whatif' });
  const pickBox = h('div', { class: 'pick' });
  const detail = h('div', { class: 'detail', id: 'whatif-detail', 'aria-live': 'polite' });
  const menu = h('div', { class: 'menu', id: 'whatif-menu' });
  const tierBox = h('div', { class: 'tier-cell', id: 'tier-cell' });

  let currentKey = '';
  const analyteSelect = h('select', { id: 'whatif-analyte' });
  const biasInput = h('input', { type: 'text', inputmode: 'decimal', id: 'obs-bias', autocomplete: 'off' });
  const cvInput = h('input', { type: 'text', inputmode: 'decimal', id: 'obs-cv', autocomplete: 'off' });
  const obsNote = h('p', { class: 'hint', id: 'obs-note' });

  function rowsInScope(): VariationRow[] {
    const picked = state.selectedRows();
    return picked.length ? picked : [...state.rows()];
  }

  function currentRow(): VariationRow | undefined {
    return state.rows().find((r) => keyOf(r) === currentKey);
  }

  function z(): number | null {
    const q = zOf(state.coverage);
    return q.ok ? q.z : null;
  }

  function renderPick(): void {
    const rows = rowsInScope();
    replace(analyteSelect);
    for (const r of rows) analyteSelect.appendChild(h('option', { value: keyOf(r) }, displayName(r)));
    if (!rows.some((r) => keyOf(r) === currentKey)) currentKey = rows.length ? keyOf(rows[0]) : '';
    analyteSelect.value = currentKey;
    syncInputs();
  }

  function syncInputs(): void {
    const o = state.observed.get(currentKey);
    biasInput.value = o ? String(o.bias) : '';
    cvInput.value = o ? String(o.cv) : '';
    obsNote.textContent = o ? (o.from === 'typed' ? 'Typed in the pane.' : `Read from ${o.from}.`) : 'Type the method’s observed bias and CV (percent), or read them from the active row.';
  }

  analyteSelect.addEventListener('change', () => {
    currentKey = analyteSelect.value;
    syncInputs();
    renderDetail();
  });

  function typed(): void {
    const b = readDecimal(biasInput.value);
    const c = readDecimal(cvInput.value);
    if (biasInput.value.trim() === '' && cvInput.value.trim() === '') {
      state.observed.delete(currentKey);
    } else if (b !== undefined && c !== undefined) {
      state.observed.set(currentKey, { bias: b, cv: c, from: 'typed' });
    } else {
      obsNote.textContent = 'Bias and CV must both be numbers (a decimal point or comma; a trailing % is fine).';
      renderDetail();
      return;
    }
    obsNote.textContent = state.observed.has(currentKey) ? 'Typed in the pane.' : obsNote.textContent;
    renderDetail();
    renderMenu();
  }
  biasInput.addEventListener('input', typed);
  cvInput.addEventListener('input', typed);

  const readRow = h('button', { type: 'button', id: 'read-active-row' }, 'Read the active row');
  readRow.addEventListener('click', () => {
    void (async () => {
      try {
        ctx.status('Reading the active row…', 'busy');
        const sheet = await ctx.host.readActiveSheet();
        const got = readActiveRow(sheet);
        if (!got.ok) {
          ctx.status(`Nothing read: ${got.why}.`, 'error');
          return;
        }
        const r = got.value;
        const match = state.rows().find((x) => keyOf(x) === keyOf(r)) ?? state.rows().find((x) => x.analyte.trim().toLowerCase() === r.analyte.toLowerCase());
        if (!match) {
          ctx.status(`Row ${r.row} names “${r.analyte}”, which is not in the table in use.`, 'error');
          return;
        }
        if (r.bias === null || r.cv === null) {
          ctx.status(`Row ${r.row} (${r.analyte}) has no observed ${r.bias === null ? 'bias' : 'CV'}: add columns headed “Bias %” and “CV %” and fill them.`, 'error');
          return;
        }
        currentKey = keyOf(match);
        state.selected.add(currentKey);
        state.observed.set(currentKey, { bias: r.bias, cv: r.cv, from: `${sheet.grid.sheet} ${r.biasCell}, ${r.cvCell}` });
        state.changed('observed');
        renderPick();
        renderDetail();
        renderMenu();
        ctx.status(`Read ${r.analyte}: bias ${r.bias} %, CV ${r.cv} % from row ${r.row}.`, 'ok');
      } catch (e) {
        ctx.status(e instanceof Error ? e.message : String(e), 'error');
      }
    })();
  });

  const demoBox = h('div', { class: 'actions', id: 'demo-observed' });
  function renderDemoBox(): void {
    if (!state.table?.demo) {
      replace(demoBox);
      demoBox.hidden = true;
      return;
    }
    demoBox.hidden = false;
    const b = h('button', { type: 'button', id: 'use-demo-observed' }, 'Use the demo’s invented study results');
    b.addEventListener('click', () => {
      const obs = demoObserved();
      for (const o of obs) state.observed.set(o.key, { bias: o.bias, cv: o.cv, from: 'the demo’s invented replication and EQA data' });
      state.changed('observed');
      syncInputs();
      renderDetail();
      renderMenu();
      ctx.status(`Observed bias (mean % bias against EQA targets) and within-lab CV (one-way ANOVA by day) for ${obs.length} demo analytes — ${DEMO_MARKER}.`, 'ok');
    });
    replace(demoBox, b);
  }

  replace(
    pickBox,
    h('h2', {}, 'What if another tier?'),
    field('Analyte', analyteSelect),
    h(
      'fieldset',
      { class: 'observed' },
      h('legend', {}, 'Observed performance'),
      h('div', { class: 'pair' }, field('Bias %', biasInput), field('CV %', cvInput)),
      obsNote,
      h('div', { class: 'actions' }, readRow),
      demoBox,
    ),
  );

  function tierTableOf(res: WhatIfResult, withObserved: boolean): HTMLTableElement {
    const head = ['Tier', 'CV', 'Bias', 'Total'];
    if (withObserved) head.push('Sigma', 'Share', 'Met');
    const tbody = h('tbody', {});
    for (const r of res.rows) {
      const cells: Array<HTMLElement> = [
        h('th', { scope: 'row' }, tierLabel(r.tier)),
        h('td', { 'data-col': 'cv' }, showFigure(r.cv)),
        h('td', { 'data-col': 'bias' }, showFigure(r.bias)),
        h('td', { 'data-col': 'total' }, showFigure(r.total)),
      ];
      if (withObserved) {
        cells.push(h('td', { 'data-col': 'sigma' }, showFigure(r.sigma)));
        cells.push(h('td', { 'data-col': 'share' }, showFigure(r.share, 'pct')));
        cells.push(h('td', { 'data-col': 'met', class: r.met ? 'yes' : 'no' }, r.met === undefined ? '—' : r.met ? 'yes' : 'no'));
      }
      tbody.appendChild(h('tr', { 'data-tier': r.tier }, ...cells));
    }
    return h(
      'table',
      { class: 'grid-table numbers', id: 'whatif-tiers' },
      h('caption', {}, 'Allowable, % (total error at the z in use)'),
      h('thead', {}, h('tr', {}, ...head.map((t) => h('th', { scope: 'col' }, t)))),
      tbody,
    );
  }

  function renderDetail(): void {
    const r = currentRow();
    const zz = z();
    if (!r) {
      replace(detail, h('p', { class: 'hint' }, 'Pick a table with analytes first (Tables).'));
      return;
    }
    if (zz === null) {
      replace(detail, h('p', { class: 'error' }, 'The coverage in Fill is not valid: set a z or a probability there.'));
      return;
    }
    const o = state.observed.get(currentKey) ?? null;
    const res = whatIf(inputOf(r, zz, o));
    const metText =
      res.tierMet === undefined ? null : typeof res.tierMet === 'string' ? (res.tierMet === 'none' ? 'none of the three tiers' : tierLabel(res.tierMet)) : `not known (${res.tierMet.why})`;
    const bars = res.rows.filter((x) => x.total.ok).map((x) => ({ label: tierLabel(x.tier), allowable: (x.total as { value: number }).value, met: x.met }));
    replace(
      detail,
      h('p', { class: 'context' }, `${displayName(r)} · CVI ${fmt(r.cvi)} %${r.cvg === null ? ', no CVG' : ` · CVG ${fmt(r.cvg)} %`} · z ${fmt(zz, 3)}`),
      state.table?.demo ? h('p', { class: 'badge demo' }, DEMO_MARKER) : null,
      tierTableOf(res, o !== null),
      o && res.observedTotal
        ? h(
            'dl',
            { class: 'facts result', id: 'whatif-result' },
            h('dt', {}, 'Observed total error'),
            h('dd', { 'data-value': res.observedTotal.ok ? String(res.observedTotal.value) : '' }, res.observedTotal.ok ? `${fmt(res.observedTotal.value)} %` : res.observedTotal.why),
            h('dt', {}, 'Most stringent tier met'),
            h('dd', { id: 'tier-met', 'data-value': typeof res.tierMet === 'string' ? res.tierMet : '' }, metText ?? '—'),
          )
        : null,
      bars.length ? allowanceChart(bars, o && res.observedTotal?.ok ? res.observedTotal.value : null, `${displayName(r)}: observed error against each allowance`) : null,
    );
  }

  /** The figures for every analyte in scope at its own tier; returns the script time in ms. */
  function renderMenu(): number {
    const t0 = performance.now();
    const zz = z();
    const rows = rowsInScope();
    if (zz === null || rows.length === 0) {
      replace(menu);
      return 0;
    }
    const tbody = h('tbody', {});
    const counts: Record<string, number> = { optimum: 0, desirable: 0, minimum: 0, none: 0, unknown: 0 };
    const frag = document.createDocumentFragment();
    for (const r of rows) {
      const k = keyOf(r);
      const o = state.observed.get(k) ?? null;
      const tier = state.tierFor(r);
      const res = whatIf(inputOf(r, zz, o));
      const at = res.rows[TIERS.indexOf(tier)];
      const met = typeof res.tierMet === 'string' ? res.tierMet : null;
      counts[met ?? 'unknown'] += 1;
      frag.appendChild(
        h(
          'tr',
          { 'data-key': attrKey(k) },
          h('th', { scope: 'row' }, displayName(r)),
          h('td', {}, tierLabel(tier).slice(0, 3)),
          h('td', { 'data-col': 'total' }, showFigure(at.total)),
          h('td', { 'data-col': 'sigma' }, o ? showFigure(at.sigma) : '—'),
          h('td', { 'data-col': 'share' }, o ? showFigure(at.share, 'pct') : '—'),
          h('td', { 'data-col': 'met' }, met === null ? '—' : met === 'none' ? 'none' : tierLabel(met).slice(0, 3)),
        ),
      );
    }
    tbody.appendChild(frag);
    const observedCount = rows.length - counts.unknown;
    const readAll = h('button', { type: 'button', id: 'read-sheet-observed' }, 'Read bias and CV for all rows of the active sheet');
    readAll.addEventListener('click', () => void readWholeSheet());
    replace(
      menu,
      h('h2', {}, `All picked analytes (${rows.length})`),
      h(
        'p',
        { class: 'hint', id: 'menu-counts' },
        observedCount
          ? `With observed data: ${observedCount}. Meet optimum ${counts.optimum}, desirable ${counts.desirable}, minimum ${counts.minimum}, none ${counts.none}.`
          : 'No observed data yet: type them above or read them from the sheet.',
      ),
      h('div', { class: 'actions' }, readAll),
      h(
        'div',
        { class: 'scroll-x' },
        h(
          'table',
          { class: 'grid-table numbers compact', id: 'menu-table' },
          h('caption', {}, 'At each analyte’s own tier; total error %, sigma, share of the allowance, tier met'),
          h('thead', {}, h('tr', {}, ...['Analyte', 'Tier', 'Total', 'Sigma', 'Share', 'Met'].map((t) => h('th', { scope: 'col' }, t)))),
          tbody,
        ),
      ),
    );
    const ms = performance.now() - t0;
    menu.dataset.renderMs = ms.toFixed(1);
    return ms;
  }

  async function readWholeSheet(): Promise<void> {
    try {
      ctx.status('Reading the active sheet…', 'busy');
      const sheet = await ctx.host.readActiveSheet();
      const t0 = performance.now();
      const got = readAllRows(sheet);
      if (!got.ok) {
        ctx.status(`Nothing read: ${got.why}.`, 'error');
        return;
      }
      const byKey = new Map(state.rows().map((r) => [keyOf(r), r] as const));
      let n = 0;
      let unknown = 0;
      for (const r of got.rows) {
        if (r.bias === null || r.cv === null) continue;
        const row = byKey.get(keyOf(r));
        if (!row) {
          unknown++;
          continue;
        }
        const k = keyOf(row);
        state.observed.set(k, { bias: r.bias, cv: r.cv, from: `${sheet.grid.sheet} ${r.biasCell}, ${r.cvCell}` });
        state.selected.add(k);
        n++;
      }
      state.changed('observed');
      renderPick();
      renderDetail();
      renderMenu();
      const ms = performance.now() - t0;
      menu.dataset.sheetMs = ms.toFixed(1);
      ctx.status(
        n ? `Read observed bias and CV for ${n} analyte${n === 1 ? '' : 's'} from ${sheet.grid.sheet}${unknown ? ` (${unknown} row${unknown === 1 ? '' : 's'} not in the table)` : ''}.` : `No rows with both bias and CV on ${sheet.grid.sheet}: add columns headed “Bias %” and “CV %”.`,
        n ? 'ok' : 'error',
      );
    } catch (e) {
      ctx.status(e instanceof Error ? e.message : String(e), 'error');
    }
  }

  // ---- the tier cell of a filled sheet ------------------------------------------------------
  let newTier: Tier = state.sheetTier;
  function renderTierBox(): void {
    const f = state.filled;
    const apply = h('button', { type: 'button', id: 'apply-tier', class: 'primary', disabled: !f }, 'Set the sheet’s tier cell');
    apply.addEventListener('click', () => {
      if (!state.filled) return;
      const target = state.filled;
      void (async () => {
        try {
          ctx.status(`Setting ${target.sheet}!${target.tierCell} to “${newTier}”…`, 'busy');
          await ctx.host.setTierCell({ sheet: target.sheet, cell: target.tierCell, tier: newTier });
          state.filled = { ...target, tier: newTier };
          state.sheetTier = newTier;
          state.changed('tiers');
          ctx.status(`${target.sheet} now uses the ${newTier} tier; Excel recalculates its formulas.`, 'ok');
          renderTierBox();
          renderDetail();
          renderMenu();
        } catch (e) {
          ctx.status(e instanceof Error ? e.message : String(e), 'error');
        }
      })();
    });
    const find = h('button', { type: 'button', id: 'find-tier-cell' }, 'Use the active sheet');
    find.addEventListener('click', () => {
      void (async () => {
        try {
          ctx.status('Looking for the tier cell on the active sheet…', 'busy');
          const sheet = await ctx.host.readActiveSheet();
          const found = findTierCell(sheet);
          if (!found) {
            ctx.status(`${sheet.grid.sheet} has no “${TIER_CELL_LABEL}” cell: it was not filled by Leeway, or the block was removed.`, 'error');
            return;
          }
          let tier = state.sheetTier;
          try {
            tier = readTier(found.tier);
          } catch {
            /* the cell holds something else: keep the pane's tier */
          }
          state.filled = { sheet: sheet.grid.sheet, tierCell: found.tierCell, zCell: found.zCell ?? '', tier };
          newTier = tier;
          state.changed('filled');
          renderTierBox();
          ctx.status(`Found the tier cell of ${sheet.grid.sheet} at ${found.tierCell} (now “${found.tier}”).`, 'ok');
        } catch (e) {
          ctx.status(e instanceof Error ? e.message : String(e), 'error');
        }
      })();
    });
    const name = uid('sheet-tier');
    replace(
      tierBox,
      h('h2', {}, 'Move the whole sheet'),
      f
        ? h('p', { class: 'hint', id: 'tier-target' }, `Sheet ${f.sheet}, tier cell ${f.tierCell} (now ${f.tier}). Every formula on it reads that cell.`)
        : h('p', { class: 'hint', id: 'tier-target' }, 'Fill a sheet first (Fill), or open a sheet Leeway filled and use it: its formulas read one tier cell, which this sets.'),
      radioGroup('New tier for the sheet', name, TIERS.map((t) => ({ value: t, label: tierLabel(t) })), newTier, (v) => {
        newTier = v;
      }),
      h('div', { class: 'actions' }, apply, find),
    );
  }

  // ---- why a cell shows an error (Excel keeps no message with #NUM! or #DIV/0!) --------------
  const explainBox = h('div', { class: 'explain', id: 'explain-cell-box' });
  const explainOut = h('div', { id: 'explain-result', role: 'status', 'aria-live': 'polite' });
  const explainButton = h('button', { type: 'button', id: 'explain-cell' }, 'Explain the active cell');
  explainButton.addEventListener('click', () => {
    void (async () => {
      try {
        ctx.status('Reading the active cell…', 'busy');
        const cell = await ctx.host.readActiveCell();
        const where = `${cell.sheet}!${cell.address}`;
        const call = parseLeewayCall(cell.formula);
        if (!call) {
          replace(explainOut, h('p', {}, `${where} holds no single LEEWAY formula${cell.formula ? ` (${cell.formula})` : ''}.`));
          ctx.status(`Nothing to explain in ${where}.`, 'ok');
          return;
        }
        const refs = referencesOf(call);
        const grids = refs.length ? await ctx.host.readRanges(refs) : [];
        const values = new Map<string, Grid>(refs.map((r, i) => [refKey(r.sheet, r.address), grids[i] as Grid]));
        const e = explain(call, values);
        replace(
          explainOut,
          h('p', { class: 'explain-formula' }, `${where}: ${cell.formula}`),
          h('p', { class: e.isError ? 'explain-error' : 'ok', id: 'explain-message' }, e.message),
        );
        ctx.status(e.isError ? `${where}: ${e.message}` : `${where} shows no error.`, e.isError ? 'error' : 'ok');
      } catch (err) {
        ctx.status(err instanceof Error ? err.message : String(err), 'error');
      }
    })();
  });
  explainBox.append(
    h('h2', { id: 'explain-h' }, 'Why does a cell show an error?'),
    h('p', { class: 'hint' }, 'Excel shows Leeway’s message with #VALUE! and #N/A only. Select a cell with a LEEWAY formula and the pane reads its inputs and says what to fix.'),
    h('div', { class: 'actions' }, explainButton),
    explainOut,
  );

  root.append(pickBox, detail, tierBox, menu, explainBox);
  return {
    root,
    refresh() {
      renderDemoBox();
      renderPick();
      renderDetail();
      renderTierBox();
      renderMenu();
    },
  };
}

