/**
 * Why a cell shows an error: Excel keeps no message with #NUM! or #DIV/0!, so the pane reads the
 * active cell's LEEWAY formula and its inputs and says what to fix.
 */
import { h, replace } from '../../dom';
import type { PaneContext } from '../../view';
import { explain, parseLeewayCall, referencesOf, refKey } from '../../explain';
import type { Grid } from '../../../registry/types';

/** Reads and explains the active cell into `out`; resolves to the status message. */
async function explainActive(ctx: PaneContext, out: HTMLElement): Promise<string> {
  const cell = await ctx.host.readActiveCell();
  const where = `${cell.sheet}!${cell.address}`;
  const call = parseLeewayCall(cell.formula);
  if (!call) {
    replace(out, h('p', {}, `${where} holds no single LEEWAY formula${cell.formula ? ` (${cell.formula})` : ''}.`));
    return `Nothing to explain in ${where}.`;
  }
  const refs = referencesOf(call);
  const grids = refs.length ? await ctx.host.readRanges(refs) : [];
  const values = new Map<string, Grid>(refs.map((r, i) => [refKey(r.sheet, r.address), grids[i] as Grid]));
  const e = explain(call, values);
  replace(out, h('p', { class: 'explain-formula' }, `${where}: ${cell.formula}`), h('p', { class: e.isError ? 'explain-error' : 'ok', id: 'explain-message' }, e.message));
  return e.isError ? `${where}: ${e.message}` : `${where} shows no error.`;
}

export function explainPart(ctx: PaneContext): HTMLElement {
  const out = h('div', { id: 'explain-result', role: 'status', 'aria-live': 'polite' });
  const button = h('button', { type: 'button', id: 'explain-cell' }, 'Explain the active cell');
  button.addEventListener('click', () => void ctx.run('Reading the active cell…', () => explainActive(ctx, out)));
  return h(
    'div',
    { class: 'explain', id: 'explain-cell-box' },
    h('h2', { id: 'explain-h' }, 'Why does a cell show an error?'),
    h('p', { class: 'hint' }, 'Excel shows Leeway’s message with #VALUE! and #N/A only. Select a cell with a LEEWAY formula and the pane reads its inputs and says what to fix.'),
    h('div', { class: 'actions' }, button),
    out,
  );
}
