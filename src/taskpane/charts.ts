/**
 * Two small inline SVG charts, drawn from numbers the engine computed (nothing here computes a
 * figure of merit). Sized for the narrow pane (viewBox width 288, scaled to the pane's width).
 * Each chart is an image with a text alternative; the numbers are also in the view's table, so
 * nothing is told by colour alone. Every plotted series carries its source numbers in data-*
 * attributes (full precision) so tests can compare the drawing with the engine.
 */
import { s } from './dom';
import { formatFixed } from '../engine/round';

export const CHART_WIDTH = 288;

/** A linear map from data to pixels. */
export interface Scale {
  readonly d0: number;
  readonly d1: number;
  readonly p0: number;
  readonly p1: number;
}

export function at(sc: Scale, v: number): number {
  return sc.p0 + ((v - sc.d0) / (sc.d1 - sc.d0)) * (sc.p1 - sc.p0);
}

/** A tidy upper bound for an axis: 1, 2, 2.5 or 5 times a power of ten, at least `x`. */
export function niceCeil(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) return 1;
  const p = Math.pow(10, Math.floor(Math.log10(x)));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= x * (1 - 1e-12)) return m * p;
  return 10 * p;
}

const num = (x: number): string => String(Math.round(x * 100) / 100);

export interface AllowanceBar {
  readonly label: string;
  readonly allowable: number;
  /** True/false once observed data are known; undefined before. */
  readonly met?: boolean;
}

/**
 * Observed total error against each tier's allowance: one horizontal bar per tier (its
 * allowable total error), a vertical line at the observed total error.
 */
export function allowanceChart(bars: readonly AllowanceBar[], observed: number | null, title: string): SVGElement {
  const rowH = 26;
  const left = 78;
  const right = CHART_WIDTH - 12;
  const top = observed === null ? 8 : 20;
  const height = top + bars.length * rowH + 26;
  const maxV = niceCeil(Math.max(observed ?? 0, ...bars.map((b) => b.allowable)) * 1.05);
  const sc: Scale = { d0: 0, d1: maxV, p0: left, p1: right };
  const alt =
    bars.map((b) => `${b.label} allows ${formatFixed(b.allowable, 2)} %`).join('; ') +
    (observed === null ? '' : `; observed total error ${formatFixed(observed, 2)} %`);
  const svg = s('svg', {
    class: 'chart allowance-chart',
    viewBox: `0 0 ${CHART_WIDTH} ${height}`,
    role: 'img',
    'aria-label': `${title}: ${alt}`,
  });
  svg.appendChild(s('title', {}, title));
  const axisY = top + bars.length * rowH + 2;
  for (let k = 0; k <= 4; k++) {
    const v = (maxV * k) / 4;
    const x = at(sc, v);
    svg.appendChild(s('line', { class: 'grid', x1: num(x), x2: num(x), y1: top - 2, y2: axisY }));
    svg.appendChild(s('text', { class: 'tick', x: num(x), y: axisY + 13, 'text-anchor': 'middle' }, formatFixed(v, v < 10 ? 1 : 0)));
  }
  bars.forEach((b, i) => {
    const y = top + i * rowH;
    svg.appendChild(s('text', { class: 'bar-label', x: left - 6, y: y + 16, 'text-anchor': 'end' }, b.label));
    svg.appendChild(
      s('rect', {
        class: `bar ${b.met === true ? 'met' : b.met === false ? 'unmet' : 'plain'}`,
        x: left,
        y: y + 4,
        width: num(Math.max(0, at(sc, b.allowable) - left)),
        height: rowH - 10,
        'data-allowable': String(b.allowable),
      }),
    );
  });
  if (observed !== null) {
    const x = at(sc, observed);
    svg.appendChild(
      s('line', { class: 'observed', x1: num(x), x2: num(x), y1: top - 4, y2: axisY, 'data-observed': String(observed) }),
    );
    const anchor = x > CHART_WIDTH - 80 ? 'end' : 'start';
    svg.appendChild(
      s('text', { class: 'observed-label', x: num(anchor === 'end' ? x - 4 : x + 4), y: 12, 'text-anchor': anchor }, `observed ${formatFixed(observed, 2)}`),
    );
  }
  svg.appendChild(s('text', { class: 'axis-title', x: CHART_WIDTH - 4, y: height - 1, 'text-anchor': 'end' }, 'total error, %'));
  return svg;
}

export interface CurveSeries {
  readonly label: string;
  /** Points (x, y), x ascending. */
  readonly xs: readonly number[];
  readonly ys: readonly number[];
  /** 0-based style slot: colour and dash pattern. */
  readonly style: number;
  /** Drawn thicker (the chosen plan). */
  readonly emphasis?: boolean;
  readonly data?: Readonly<Record<string, string>>;
}

export interface CurveChartOptions {
  readonly title: string;
  readonly xMax: number;
  readonly xLabel: string;
  readonly yLabel: string;
  /** A vertical marker (the critical shift). */
  readonly xMark?: { readonly value: number; readonly label: string };
  /** A horizontal marker (the detection target). */
  readonly yMark?: { readonly value: number; readonly label: string };
}

export const CURVE_HEIGHT = 200;
export const CURVE_PLOT = { left: 42, right: CHART_WIDTH - 8, top: 18, bottom: CURVE_HEIGHT - 30 } as const;

/** The scales of the curve chart, exported so tests can map plotted points back to numbers. */
export function curveScales(xMax: number): { x: Scale; y: Scale } {
  return {
    x: { d0: 0, d1: xMax, p0: CURVE_PLOT.left, p1: CURVE_PLOT.right },
    y: { d0: 0, d1: 1, p0: CURVE_PLOT.bottom, p1: CURVE_PLOT.top },
  };
}

/** Probability curves (y in [0, 1]) against x from 0 to xMax. */
export function curveChart(series: readonly CurveSeries[], o: CurveChartOptions): SVGElement {
  const { x: sx, y: sy } = curveScales(o.xMax);
  const svg = s('svg', {
    class: 'chart curve-chart',
    viewBox: `0 0 ${CHART_WIDTH} ${CURVE_HEIGHT}`,
    role: 'img',
    'aria-label': `${o.title}. ${series.map((c) => c.label).join(', ')}.${o.xMark ? ` ${o.xMark.label}.` : ''}`,
  });
  svg.appendChild(s('title', {}, o.title));
  for (let k = 0; k <= 4; k++) {
    const v = k / 4;
    const y = at(sy, v);
    svg.appendChild(s('line', { class: 'grid', x1: CURVE_PLOT.left, x2: CURVE_PLOT.right, y1: num(y), y2: num(y) }));
    svg.appendChild(s('text', { class: 'tick', x: CURVE_PLOT.left - 4, y: num(y + 3), 'text-anchor': 'end' }, formatFixed(v, 2)));
  }
  const step = o.xMax <= 5 ? 1 : o.xMax <= 10 ? 2 : 5;
  for (let v = 0; v <= o.xMax + 1e-9; v += step) {
    const x = at(sx, v);
    svg.appendChild(s('line', { class: 'grid', x1: num(x), x2: num(x), y1: CURVE_PLOT.top, y2: CURVE_PLOT.bottom }));
    svg.appendChild(s('text', { class: 'tick', x: num(x), y: CURVE_PLOT.bottom + 12, 'text-anchor': 'middle' }, String(v)));
  }
  if (o.yMark) {
    const y = at(sy, o.yMark.value);
    svg.appendChild(s('line', { class: 'mark target', x1: CURVE_PLOT.left, x2: CURVE_PLOT.right, y1: num(y), y2: num(y) }));
  }
  for (const c of series) {
    const pts: string[] = [];
    for (let i = 0; i < c.xs.length; i++) {
      if (c.xs[i] > o.xMax + 1e-9) break;
      pts.push(`${num(at(sx, c.xs[i]))},${num(at(sy, c.ys[i]))}`);
    }
    const attrs: Record<string, string> = {
      class: `curve s${c.style % 6}${c.emphasis ? ' emphasis' : ''}`,
      points: pts.join(' '),
      'data-label': c.label,
      'data-xs': c.xs.join(','),
      'data-ys': c.ys.join(','),
    };
    if (c.data) for (const k of Object.keys(c.data)) attrs[`data-${k}`] = c.data[k];
    svg.appendChild(s('polyline', attrs));
  }
  if (o.xMark && o.xMark.value >= 0 && o.xMark.value <= o.xMax) {
    const x = at(sx, o.xMark.value);
    svg.appendChild(
      s('line', { class: 'mark critical', x1: num(x), x2: num(x), y1: CURVE_PLOT.top, y2: CURVE_PLOT.bottom, 'data-value': String(o.xMark.value) }),
    );
    const anchor = x < 60 ? 'start' : x > CHART_WIDTH - 50 ? 'end' : 'middle';
    const lx = anchor === 'start' ? x - 2 : anchor === 'end' ? x + 2 : x;
    svg.appendChild(s('text', { class: 'mark-label', x: num(lx), y: CURVE_PLOT.top - 6, 'text-anchor': anchor }, o.xMark.label));
  }
  svg.appendChild(s('text', { class: 'axis-title', x: CURVE_PLOT.right, y: CURVE_HEIGHT - 4, 'text-anchor': 'end' }, o.xLabel));
  const mid = (CURVE_PLOT.top + CURVE_PLOT.bottom) / 2;
  svg.appendChild(s('text', { class: 'axis-title', x: -mid, y: 10, transform: 'rotate(-90)', 'text-anchor': 'middle' }, o.yLabel));
  return svg;
}
