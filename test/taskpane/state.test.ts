/**
 * The pane's shared state and the small pieces every view is built from: setters that notify,
 * where the sheet tier came from, following a tier cell changed in Excel, the view-local state,
 * the navigation's keys and the status text of what an action threw.
 */
import { PaneState, sheetTierWords } from '../../src/taskpane/state';
import type { Topic } from '../../src/taskpane/state';
import { ViewState, PaneError, messageOf } from '../../src/taskpane/view';
import type { PaneContext } from '../../src/taskpane/view';
import { followTierCell } from '../../src/taskpane/tierNote';
import { keyTarget } from '../../src/taskpane/nav';
import { noWorkbookHost } from '../../src/taskpane/host';
import type { PaneHost, RangeRef } from '../../src/taskpane/host';
import { demoTable } from '../../src/engine/demo';
import { numError } from '../../src/engine/errors';
import { keyOf } from '../../src/taskpane/analytes';

function recorded(state: PaneState): Topic[] {
  const heard: Topic[] = [];
  state.on((t) => heard.push(t));
  return heard;
}

describe('PaneState setters', () => {
  test('every setter notifies its topic once', () => {
    const s = new PaneState();
    s.setTable('demo', demoTable());
    const heard = recorded(s);
    const k = keyOf(demoTable().rows[0]);
    s.setSheetTier('minimum');
    s.setAnalyteTier(k, 'optimum');
    s.setCoverage({ mode: 'z', z: 2, probability: 0.95, sides: 1 });
    s.pick([k], false);
    s.setObserved([[k, { bias: 1, cv: 2, from: 'typed' }]]);
    s.setFilled({ sheet: 'S', tierCell: '$B$4', zCell: '$B$5', tier: 'minimum' });
    expect(heard).toEqual(['tiers', 'tiers', 'coverage', 'selection', 'observed', 'filled']);
    expect([s.sheetTier, s.analyteTier.get(k), s.coverage.z, s.selected.has(k), s.observed.get(k)?.cv, s.filled?.sheet]).toEqual(['minimum', 'optimum', 2, false, 2, 'S']);
    s.setAnalyteTier(k, null);
    s.setObserved([[k, null]]);
    expect([s.analyteTier.has(k), s.observed.has(k)]).toEqual([false, false]);
  });

  test('the tier’s origin: the pane’s choice, a tier cell, or the analyte’s own tier', () => {
    const s = new PaneState();
    s.setTable('demo', demoTable());
    const [r0, r1] = demoTable().rows;
    expect(s.tierOriginOf(r0)).toBe('the sheet tier chosen in Fill');
    s.setSheetTier('optimum', { kind: 'cell', sheet: 'Specifications', cell: '$B$4' });
    expect(s.tierOriginOf(r0)).toBe('the tier cell Specifications!$B$4');
    expect(s.tierCellChange).toEqual({ sheet: 'Specifications', cell: '$B$4', before: 'desirable', after: 'optimum' });
    s.setAnalyteTier(keyOf(r1), 'minimum');
    expect(s.tierOriginOf(r1)).toBe('its own tier, chosen in Fill');
    s.setSheetTier('minimum');
    expect(sheetTierWords(s.sheetTierOrigin)).toBe('the sheet tier chosen in Fill');
  });
});

describe('following the tier cell of the filled sheet', () => {
  function ctxWith(cell: unknown, reads: RangeRef[][]): PaneContext {
    const host: PaneHost = {
      ...noWorkbookHost('test'),
      label: 'test',
      available: true,
      readRanges: async (refs) => {
        reads.push([...refs]);
        return [[[cell as string]]];
      },
    };
    const state = new PaneState();
    state.setTable('demo', demoTable());
    state.setFilled({ sheet: 'Specifications', tierCell: '$B$4', zCell: '$B$5', tier: 'desirable' });
    return { host, library: undefined as never, state, status: () => undefined, run: async () => true, show: () => undefined, useTable: async () => undefined };
  }

  test('a cell typed over in Excel becomes the sheet tier, with its origin and the change', async () => {
    const reads: RangeRef[][] = [];
    const ctx = ctxWith(' Min ', reads);
    await followTierCell(ctx);
    expect(reads).toEqual([[{ sheet: 'Specifications', address: 'B4' }]]);
    expect(ctx.state.sheetTier).toBe('minimum');
    expect(ctx.state.sheetTierOrigin).toEqual({ kind: 'cell', sheet: 'Specifications', cell: '$B$4' });
    expect(ctx.state.filled?.tier).toBe('minimum');
    expect(ctx.state.tierCellChange).toEqual({ sheet: 'Specifications', cell: '$B$4', before: 'desirable', after: 'minimum' });
  });

  test('an unchanged cell does not undo a tier chosen in Fill since; a cell without a tier changes nothing', async () => {
    for (const cell of ['desirable', 'not a tier', 3, null]) {
      const ctx = ctxWith(cell, []);
      ctx.state.setSheetTier('optimum');
      await followTierCell(ctx);
      expect({ cell, tier: ctx.state.sheetTier, origin: ctx.state.sheetTierOrigin.kind }).toEqual({ cell, tier: 'optimum', origin: 'pane' });
    }
  });
});

describe('view pieces', () => {
  test('ViewState merges a patch and notifies with the new state', () => {
    const v = new ViewState({ a: 1, b: 'x' });
    const seen: Array<{ a: number; b: string }> = [];
    v.on((s) => seen.push({ ...s }));
    v.set({ a: 2 });
    v.set({ b: 'y' });
    expect(seen).toEqual([{ a: 2, b: 'x' }, { a: 2, b: 'y' }]);
    expect(v.get()).toEqual({ a: 2, b: 'y' });
  });

  test('what an action threw, as the status line shows it', () => {
    expect(messageOf(numError('cv must not be zero'))).toBe('#NUM! cv must not be zero');
    expect(messageOf(new PaneError('Nothing read: the sheet is empty.'))).toBe('Nothing read: the sheet is empty.');
    expect(messageOf('plain')).toBe('plain');
  });

  test('arrow keys wrap, Home and End go to the ends, other keys do nothing', () => {
    expect([keyTarget('ArrowRight', 3, 4), keyTarget('ArrowLeft', 0, 4), keyTarget('Home', 2, 4), keyTarget('End', 0, 4), keyTarget('a', 1, 4)]).toEqual([0, 3, 0, 3, null]);
  });
});
