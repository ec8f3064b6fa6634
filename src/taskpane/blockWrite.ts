/**
 * Writing a block beside the user's data, shared by the study views: the host's write, the
 * cells it refused to replace kept for the confirmation, and the confirmation itself. Also the
 * re-render that keeps the keyboard focus where it was.
 */
import { h } from './dom';
import type { PaneHost, BlockArea, BlockOutcome } from './host';
import { PaneError } from './view';

/**
 * Writes the areas; when cells where they go hold something, `onOccupied` gets their addresses
 * and the refusal is thrown as a PaneError (nothing was written).
 */
export async function writeAreas(host: PaneHost, sheet: string, areas: BlockArea[], overwrite: boolean, onOccupied: (addresses: readonly string[] | null) => void): Promise<BlockOutcome> {
  try {
    const out = await host.writeBlock({ sheet, areas, overwrite });
    onOccupied(null);
    return out;
  } catch (e) {
    const taken = (e as { name?: string; addresses?: string[] }).addresses;
    if ((e as { name?: string }).name === 'OccupiedError' && taken) onOccupied(taken);
    throw new PaneError(`Nothing written: ${e instanceof Error ? e.message : String(e)}`);
  }
}

/** Asked when the block's place holds something: replace, or leave the sheet as it is. */
export function renderConfirm(prefix: string, addresses: readonly string[], replace: () => void, cancel: () => void): HTMLElement {
  const one = addresses.length === 1;
  const yes = h('button', { type: 'button', class: 'primary', id: `${prefix}-replace` }, one ? 'Replace it' : 'Replace them');
  const no = h('button', { type: 'button', id: `${prefix}-keep` }, 'Keep the sheet as it is');
  yes.addEventListener('click', replace);
  no.addEventListener('click', cancel);
  return h(
    'div',
    { class: 'confirm', role: 'alertdialog', 'aria-labelledby': `${prefix}-confirm-title` },
    h('h3', { id: `${prefix}-confirm-title` }, one ? '1 cell already holds something' : `${addresses.length} cells already hold something`),
    h('p', {}, `${addresses.slice(0, 8).join(', ')}${addresses.length > 8 ? ', …' : ''}. ${one ? 'Replacing it loses what it holds.' : 'Replacing them loses what they hold.'}`),
    h('div', { class: 'actions' }, yes, no),
  );
}

/** Runs a re-render and puts the focus back on the control (by id) that had it. */
export function keepingFocus(render: () => void): void {
  const id = document.activeElement instanceof HTMLElement ? document.activeElement.id : '';
  render();
  if (id && document.activeElement?.id !== id) document.getElementById(id)?.focus();
}

/**
 * A render that is never re-entered: replacing a focused input blurs it, and its change handler
 * may set state (and render) while the outer render is still replacing nodes. Such a nested
 * call is deferred until the outer one ends, then runs once with the latest state.
 */
export function serialRender(render: () => void): () => void {
  let busy = false;
  let again = false;
  const run = (): void => {
    if (busy) {
      again = true;
      return;
    }
    busy = true;
    try {
      keepingFocus(render);
    } finally {
      busy = false;
    }
    if (again) {
      again = false;
      run();
    }
  };
  return run;
}
