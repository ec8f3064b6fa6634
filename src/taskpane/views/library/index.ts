/**
 * Tables view: the user's library of variation tables (list.ts) and importing a new one with its
 * report (importer.ts, review.ts). The demo table is built in and always marked as demo data.
 */
import { h } from '../../dom';
import type { PaneContext, View } from '../../view';
import { listPart } from './list';
import { importPart } from './importer';

export function libraryView(ctx: PaneContext): View {
  const list = listPart(ctx);
  const { importBox, reviewBox } = importPart(ctx, () => list.render());
  const root = h('div', { class: 'view library' }, list.root, importBox, reviewBox);
  return {
    root,
    refresh() {
      void list.render();
    },
  };
}
