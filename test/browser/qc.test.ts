/**
 * Task pane in Chromium, QC and Summary views: the plan shown equals QC.PLAN (through the same
 * registry Excel evaluates); the power curves are drawn from the QC engine's powerCurve (points
 * compared with the engine and with the chart's own scales); the critical shift is marked; the
 * view redraws within a frame once its curves are cached; the summary sheet request carries one
 * row per analyte with the engine's figures, the provenance and the caution.
 */
import type { Page } from 'playwright-core';
import { describeInBrowser, usePane } from './harness';
import { view, lastCall, screenshot } from './helpers';
import { evaluate } from '../../src/registry';
import { planQc } from '../../src/engine/qc/plan';
import { powerCurve, shiftAxis } from '../../src/engine/qc/power';
import { curveScales, at } from '../../src/taskpane/charts';
import { axisMax } from '../../src/taskpane/views/qc';
import { demoTable } from '../../src/engine/demo';
import { summaryRow } from '../../src/taskpane/summaryRows';
import { demoObserved } from '../../src/taskpane/demo';
import { keyOf } from '../../src/taskpane/analytes';
import type { SummaryRequest, SummaryRow } from '../../src/taskpane/host';
import { relClose } from '../support/prng';
import { CAUTION, DEMO_MARKER } from '../../src/engine/caution';

/**
 * The page's V8 (Chromium) and Node's may differ in the last bits of exp/log, so probabilities
 * from the multirule chains are compared to 1e-12 relative; everything else exactly.
 */
function close(a: number, b: number): boolean {
  return a === b || relClose(a, b, 1e-12) || Math.abs(a - b) < 1e-15;
}

function expectSameRow(got: SummaryRow, want: SummaryRow): void {
  const { detection: d1, falseRejection: f1, ...rest1 } = got;
  const { detection: d2, falseRejection: f2, ...rest2 } = want;
  expect(rest1).toEqual(rest2);
  for (const [a, b] of [[d1, d2], [f1, f2]]) {
    if (typeof a === 'number' && typeof b === 'number') expect(close(a, b)).toBe(true);
    else expect(a).toEqual(b);
  }
}

async function typeFigures(page: Page, allowable: number, bias: number, cv: number): Promise<void> {
  await page.fill('#qc-allowable', String(allowable));
  await page.fill('#qc-bias', String(bias));
  await page.fill('#qc-cv', String(cv));
  await page.waitForSelector('#qc-plan dl.plan-facts');
}

describeInBrowser('task pane: QC design and summary', () => {
  const open = usePane();

  test('the plan shown equals QC.PLAN for typed figures', async () => {
    const { context, page, errors } = await open();
    await view(page, 'qc');
    for (const [allowable, bias, cv] of [
      [10, 1, 2],
      [6.43, -0.5, 1.1],
      [20, 2, 6],
      [5, 4, 2],
    ]) {
      await typeFigures(page, allowable, bias, cv);
      const shown = await page.$eval('#qc-plan dl.plan-facts', (e) => ({ ...(e as HTMLElement).dataset }));
      const spill = evaluate('QC.PLAN', [allowable, bias, cv]);
      const [rule, n, runs, detection, fr, met] = spill[1];
      expect(shown.rule).toBe(rule);
      expect(Number(shown.n)).toBe(n);
      expect(Number(shown.runs)).toBe(runs);
      expect(close(Number(shown.detection), detection as number)).toBe(true);
      expect(close(Number(shown.falseRejection), fr as number)).toBe(true);
      expect(shown.targetMet).toBe(String(met === true || met === 'TRUE' || met === 'yes'));
      expect(Number(shown.criticalShift)).toBe(planQc(allowable, bias, cv).criticalShift);
      expect(await page.textContent('#qc-plan dd.rule')).toBe(rule);
    }
    expect(errors).toEqual([]);
    await context.close();
  });

  test('the curves plotted are the engine’s power curves; the critical shift is marked', async () => {
    const { context, page } = await open();
    await view(page, 'qc');
    await typeFigures(page, 10, 1, 2);
    const plan = planQc(10, 1, 2);
    const xMax = axisMax(plan.criticalShift);
    const curves = await page.$$eval('#qc-curves polyline.curve', (els) =>
      els.map((e) => ({ rule: e.getAttribute('data-rule')!, n: Number(e.getAttribute('data-n')), runs: Number(e.getAttribute('data-runs')), xs: e.getAttribute('data-xs')!.split(',').map(Number), ys: e.getAttribute('data-ys')!.split(',').map(Number), points: e.getAttribute('points')!, emphasis: e.classList.contains('emphasis') })),
    );
    expect(curves.length).toBeGreaterThanOrEqual(4);
    expect(curves.filter((c) => c.emphasis).map((c) => [c.rule, c.n, c.runs])).toEqual([[plan.rule, plan.n, plan.runs]]);
    const { x: sx, y: sy } = curveScales(xMax);
    for (const c of curves) {
      const engine = powerCurve(c.rule, c.n, c.runs, shiftAxis(xMax, 0.1));
      expect(c.xs).toEqual(engine.map((p) => p.shift));
      expect(c.ys).toHaveLength(engine.length);
      c.ys.forEach((y, i) => expect(close(y, engine[i].p)).toBe(true));
      // A few plotted points, mapped back through the chart's scales (the SVG keeps 2 decimals).
      const pts = c.points.split(' ').map((p) => p.split(',').map(Number));
      for (const i of [0, 10, 25, Math.floor(engine.length / 2), engine.length - 1]) {
        expect(Math.abs(pts[i][0] - at(sx, engine[i].shift))).toBeLessThanOrEqual(0.005 + 1e-9);
        expect(Math.abs(pts[i][1] - at(sy, engine[i].p))).toBeLessThanOrEqual(0.005 + 1e-9);
      }
    }
    expect(Number(await page.getAttribute('#qc-curves line.mark.critical', 'data-value'))).toBe(plan.criticalShift);
    expect(await page.textContent('#qc-curves .mark-label')).toBe(`critical ${plan.criticalShift.toFixed(2)}`);
    // Another candidate can be added to the chart.
    await page.click('.curve-pick summary');
    await page.check('.curve-pick input[value="1-2.5s|4|1"]');
    expect(await page.$$eval('#qc-curves polyline[data-rule="1-2.5s"][data-n="4"]', (e) => e.length)).toBe(1);
    await page.click('.curve-pick summary');
    await screenshot(page, 'pane-qc.png');
    await context.close();
  });

  test('once its curves are cached the QC view redraws within a frame', async () => {
    const { context, page } = await open();
    await view(page, 'qc');
    await typeFigures(page, 10, 1, 2);
    // Same axis (critical shift 2.85 → 4 SD), different plan inputs: every curve is cached.
    const times: number[] = [];
    for (const bias of ['1.1', '0.9', '1.05', '1']) {
      await page.fill('#qc-bias', bias);
      times.push(Number(await page.getAttribute('#qc-curves', 'data-draw-ms')));
    }
    console.log(`QC view redraw with cached curves: ${times.map((t) => t.toFixed(1)).join(', ')} ms`);
    expect(Math.min(...times)).toBeLessThan(16.7);
    await context.close();
  });

  test('from an analyte: its tier’s allowable total error and its observed figures feed the plan', async () => {
    const { context, page } = await open();
    await view(page, 'whatif');
    await page.click('#use-demo-observed');
    await view(page, 'qc');
    const r = demoTable().rows[0];
    const obs = demoObserved().find((o) => o.key === keyOf(r))!;
    const row = summaryRow(r, 'desirable', 1.65, { ...obs, from: 'x' });
    await page.waitForSelector('#qc-plan dl.plan-facts');
    const shown = await page.$eval('#qc-plan dl.plan-facts', (e) => ({ ...(e as HTMLElement).dataset }));
    const plan = planQc(row.allowable as number, obs.bias, obs.cv);
    expect(shown.rule).toBe(plan.rule);
    expect(close(Number(shown.detection), plan.detection)).toBe(true);
    expect(Number(shown.criticalShift)).toBe(plan.criticalShift);
    await context.close();
  });

  test('the summary sheet request: one row per analyte with the engine’s figures, the provenance and the caution', async () => {
    const { context, page } = await open();
    await view(page, 'whatif');
    await page.click('#use-demo-observed');
    await view(page, 'summary');
    await page.waitForSelector('#summary-table');
    await screenshot(page, 'pane-summary.png');
    await page.click('#write-summary');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Wrote'));
    const req = await lastCall<SummaryRequest>(page, 'writeSummary');
    const demo = demoTable();
    const observed = new Map(demoObserved().map((o) => [o.key, o]));
    expect(req.rows).toHaveLength(demo.rows.length);
    req.rows.forEach((got, i) => {
      const r = demo.rows[i];
      const o = observed.get(keyOf(r))!;
      expectSameRow(got, summaryRow(r, 'desirable', 1.65, { bias: o.bias, cv: o.cv, from: '' }));
    });
    expect(req.header).toContain(DEMO_MARKER);
    expect(req.header[req.header.length - 1]).toBe(`Caution: ${CAUTION}`);
    expect(req.sheetName).toBe('Summary');
    await context.close();
  });
});
