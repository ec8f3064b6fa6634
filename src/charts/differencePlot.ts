/**
 * The difference plot of a method comparison (limits of agreement), as an SVG document in a string.
 *
 * Each pair of results is drawn at the mean of its two results (x axis) and their difference
 * (y axis): y − x, or 100·(y − x)/((x + y)/2) on the percent scale, as DATA.AGREEMENT computes
 * them. A solid line marks the mean difference and dashed lines the lower and upper limits of
 * agreement; behind each line a pale band spans its confidence interval, so the reader sees how
 * well the study pins each line down. A thin line marks zero difference. Each line is named, with
 * its value, in the margin at the right; a key under the plot says what the lines and bands are.
 * <title> and <desc> and the role/aria attributes describe the plot to screen readers.
 *
 * A pure function of its input: no DOM, no Node, no fonts measured. Text is sized in pixels with
 * the generic "sans-serif" family and cut to a number of characters from a generous width per
 * character (0.62 em), as the control chart does, so the drawing does not depend on the font
 * installed. Coordinates have two decimals; all text is escaped. Points and lines carry data-*
 * attributes (values at full precision) and the plot area carries the value range of its axes, so
 * the drawing can be checked against the data. Shared by the task pane (inline SVG, 288–320 px)
 * and the command line (PNG through an SVG renderer).
 */
import { cut, escapeXml, f, fits, flowKey, textWidth } from './text';

/** One pair of results: x from the comparative method, y from the candidate. */
export interface DifferencePair {
  readonly x: number;
  readonly y: number;
  /** Optional text for the point's tooltip (a sample id). */
  readonly label?: string;
}

/** The figures of DATA.AGREEMENT the plot draws, on the plot's scale. */
export interface AgreementLines {
  readonly meanDifference: number;
  readonly meanDifferenceLow: number;
  readonly meanDifferenceHigh: number;
  readonly lowerLimit: number;
  readonly lowerLimitLow: number;
  readonly lowerLimitHigh: number;
  readonly upperLimit: number;
  readonly upperLimitLow: number;
  readonly upperLimitHigh: number;
}

export interface DifferencePlotInput {
  readonly title: string;
  readonly pairs: readonly DifferencePair[];
  readonly agreement: AgreementLines;
  /** "absolute" (y − x, in `unit`) or "percent" (of the pair's mean); default "absolute". */
  readonly scale?: 'absolute' | 'percent';
  /** Unit of the results, for the axis names ("mmol/L"). */
  readonly unit?: string;
  /** Decimals of the values named beside the lines (as the figures are shown elsewhere, 0–6); default about three significant digits. */
  readonly decimals?: number;
  /** Confidence of the bands, for the key; default 0.95. */
  readonly confidence?: number;
  /** Width in px: 288–320 fits the task pane; 480–1200 for print. Default 320, accepted 240–4000. */
  readonly width?: number;
  /** Prefix of the ids of <title> and <desc>, unique per page when several plots are shown. */
  readonly id?: string;
}

const POINT_INK = '#24527a';
const MEAN_INK = '#8a4b16';
const LIMIT_INK = '#3d3d3d';
const MEAN_BAND = '#f3e3d3';
const LIMIT_BAND = '#e4e4e4';
const ZERO_INK = '#9a9a9a';

/** A number for a label: `decimals` decimals, or about three significant digits; a true minus sign. */
export function showValue(v: number, decimals?: number): string {
  const a = Math.abs(v);
  const digits = decimals ?? (a === 0 ? 2 : Math.max(0, Math.min(6, 2 - Math.floor(Math.log10(a)))));
  const s = v.toFixed(digits);
  return (/^-0(\.0+)?$/.test(s) ? s.slice(1) : s).replace('-', '−');
}

/**
 * Round tick positions inside [lo, hi]: the smallest step of 1, 2 or 5 × 10^k that gives at most
 * `most` of them, or the next smaller one when that would leave fewer than two.
 */
function niceTicks(lo: number, hi: number, most: number): { ticks: number[]; step: number } {
  const e0 = Math.floor(Math.log10(hi - lo));
  const count = (s: number): number => Math.floor(hi / s) - Math.ceil(lo / s) + 1;
  const steps: number[] = [];
  for (let e = e0 - 3; e <= e0 + 1; e++) for (const m of [1, 2, 5]) steps.push(m * 10 ** e);
  let i = steps.findIndex((s) => count(s) <= most);
  if (i < 0) i = steps.length - 1;
  if (i > 0 && count(steps[i]) < 2) i--;
  const step = steps[i];
  const ticks: number[] = [];
  for (let k = Math.ceil(lo / step - 1e-9); k * step <= hi + step * 1e-9; k++) ticks.push(k * step);
  return { ticks, step };
}

function tickText(v: number, step: number): string {
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  const s = v.toFixed(decimals);
  return (/^-0(\.0+)?$/.test(s) ? s.slice(1) : s).replace('-', '−');
}

/** The difference of a pair on the plot's scale. */
export function pairDifference(p: DifferencePair, scale: 'absolute' | 'percent'): number {
  if (scale === 'absolute') return p.y - p.x;
  const mean = (p.x + p.y) / 2;
  if (mean === 0) throw new RangeError(`pair (${p.x}, ${p.y}) has a mean of 0: no percent difference`);
  return (100 * (p.y - p.x)) / mean;
}

/** Spreads label centres apart by at least `gap`, keeping them inside [lo, hi] and in their order. */
function spread(ys: number[], gap: number, lo: number, hi: number): number[] {
  const order = ys.map((y, i) => ({ y, i })).sort((a, b) => a.y - b.y);
  const out = order.map((o) => o.y);
  for (let k = 1; k < out.length; k++) out[k] = Math.max(out[k], out[k - 1] + gap);
  if (out.length && out[out.length - 1] > hi) {
    out[out.length - 1] = hi;
    for (let k = out.length - 2; k >= 0; k--) out[k] = Math.min(out[k], out[k + 1] - gap);
  }
  if (out.length && out[0] < lo) {
    out[0] = lo;
    for (let k = 1; k < out.length; k++) out[k] = Math.max(out[k], out[k - 1] + gap);
  }
  const result = new Array<number>(ys.length);
  order.forEach((o, k) => (result[o.i] = out[k]));
  return result;
}

/**
 * The plot as an SVG document (a string starting with "<svg"). Throws a RangeError for a width
 * outside 240–4000 px, a pair or figure that is not a finite number, or (percent scale) a pair
 * whose mean is 0.
 */
export function differencePlotSvg(input: DifferencePlotInput): string {
  const W = input.width ?? 320;
  if (!(W >= 240 && W <= 4000)) throw new RangeError(`plot width must be 240 to 4000 px (got ${W})`);
  const decimals = input.decimals;
  if (decimals !== undefined && !(Number.isInteger(decimals) && decimals >= 0 && decimals <= 6)) throw new RangeError(`decimals must be a whole number from 0 to 6 (got ${decimals})`);
  const scale = input.scale ?? 'absolute';
  const a = input.agreement;
  const figures = Object.entries(a) as Array<[keyof AgreementLines, number]>;
  for (const [k, v] of figures) if (!Number.isFinite(v)) throw new RangeError(`agreement figure ${k} is ${v}: it must be a finite number`);
  const points = input.pairs.map((p, i) => {
    if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) throw new RangeError(`pair ${i + 1} is (${p.x}, ${p.y}): both must be finite numbers`);
    return { mean: (p.x + p.y) / 2, d: pairDifference(p, scale), pair: p, index: i + 1 };
  });
  const id = (input.id ?? 'leeway-difference-plot').replace(/[^A-Za-z0-9_-]/g, '-');
  const confidence = input.confidence ?? 0.95;
  const pct = `${Number((confidence * 100).toPrecision(6))} %`;
  const unit = input.unit ?? '';
  const wide = W >= 480;
  const fsTitle = wide ? 15 : 12;
  const fsText = wide ? 11 : 9;
  const r = wide ? 3.2 : 2.6;
  const pad = 8;

  // Value ranges: every difference, every band, and zero; a little room above and below.
  const ys = [0, ...points.map((p) => p.d), a.lowerLimitLow, a.lowerLimitHigh, a.upperLimitLow, a.upperLimitHigh, a.meanDifferenceLow, a.meanDifferenceHigh];
  let yLo = Math.min(...ys);
  let yHi = Math.max(...ys);
  if (yHi - yLo === 0) {
    yLo -= 1;
    yHi += 1;
  }
  const yPad = (yHi - yLo) * 0.06;
  yLo -= yPad;
  yHi += yPad;
  let xLo = points.length ? Math.min(...points.map((p) => p.mean)) : 0;
  let xHi = points.length ? Math.max(...points.map((p) => p.mean)) : 1;
  if (xHi - xLo === 0) {
    const h = Math.abs(xLo) * 0.05 || 0.5;
    xLo -= h;
    xHi += h;
  }
  const xPad = (xHi - xLo) * 0.04;
  xLo -= xPad;
  xHi += xPad;

  const yTicks = niceTicks(yLo, yHi, wide ? 8 : 6);
  const yTickTexts = yTicks.ticks.map((t) => tickText(t, yTicks.step));
  const lines = [
    { kind: 'upper', name: 'upper', value: a.upperLimit, low: a.upperLimitLow, high: a.upperLimitHigh },
    { kind: 'mean', name: 'mean', value: a.meanDifference, low: a.meanDifferenceLow, high: a.meanDifferenceHigh },
    { kind: 'lower', name: 'lower', value: a.lowerLimit, low: a.lowerLimitLow, high: a.lowerLimitHigh },
  ] as const;
  const lineTexts = lines.map((l) => `${l.name} ${showValue(l.value, decimals)}`);

  const top = pad + fsTitle + 10;
  const left = pad + fsText + 6 + Math.max(...yTickTexts.map((t) => textWidth(t, fsText))) + 5;
  const rightMargin = Math.max(...lineTexts.map((t) => textWidth(t, fsText))) + 8;
  const right = W - pad - rightMargin;
  const plotW = right - left;
  const plotH = Math.round(Math.min(420, Math.max(150, W * 0.56)));
  const bottom = top + plotH;
  const keyTop = bottom + fsText + 6 + fsText + 10;
  const keyRow = fsText + 7;
  const keyEntries = [
    { kind: 'mean', text: 'mean difference' },
    { kind: 'limit', text: 'limits of agreement (±1.96 SD)' },
    { kind: 'band', text: `${pct} confidence interval of each line` },
  ];
  const sample = 22;
  const { placed: keyPlaced, rows: keyRows } = flowKey(keyEntries.map((e) => sample + 4 + textWidth(e.text, fsText) + 12), pad, W - pad);
  const H = Math.round(keyTop + keyRows * keyRow + pad);

  const xOf = (v: number): number => left + ((v - xLo) / (xHi - xLo)) * plotW;
  const yOf = (v: number): number => top + ((yHi - v) / (yHi - yLo)) * plotH;

  const diffName = scale === 'percent' ? 'Difference y − x (% of mean)' : `Difference y − x${unit ? ` (${unit})` : ''}`;
  const meanName = `Mean of x and y${unit ? ` (${unit})` : ''}`;
  const desc =
    points.length === 0
      ? 'No pairs to show.'
      : `Difference plot of ${points.length} pair${points.length === 1 ? '' : 's'}: ${scale === 'percent' ? 'percent difference' : 'difference y − x'} against the mean of the pair. ` +
        `Mean difference ${showValue(a.meanDifference)} (${pct} interval ${showValue(a.meanDifferenceLow)} to ${showValue(a.meanDifferenceHigh)}); ` +
        `limits of agreement ${showValue(a.lowerLimit)} (${showValue(a.lowerLimitLow)} to ${showValue(a.lowerLimitHigh)}) and ${showValue(a.upperLimit)} (${showValue(a.upperLimitLow)} to ${showValue(a.upperLimitHigh)}). ` +
        `${points.filter((p) => p.d < a.lowerLimit || p.d > a.upperLimit).length} pair(s) outside the limits.`;

  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" ` +
      `aria-label="${escapeXml(input.title)}" aria-describedby="${id}-desc" font-family="sans-serif">`,
  );
  out.push(`<title id="${id}-title">${escapeXml(input.title)}</title>`);
  out.push(`<desc id="${id}-desc">${escapeXml(desc)}</desc>`);
  out.push(`<rect class="background" x="0.00" y="0.00" width="${f(W)}" height="${f(H)}" fill="#ffffff"/>`);
  out.push(
    `<text class="title" x="${f(pad)}" y="${f(pad + fsTitle)}" font-size="${fsTitle}" font-weight="bold" fill="#202020">${escapeXml(cut(input.title, fits(W - 2 * pad, fsTitle)))}</text>`,
  );
  out.push(
    `<g class="plot-area" data-x-low="${xLo}" data-x-high="${xHi}" data-y-low="${yLo}" data-y-high="${yHi}" data-left="${f(left)}" data-top="${f(top)}" data-width="${f(plotW)}" data-height="${f(plotH)}" data-scale="${scale}">`,
  );
  // Bands first, so lines and points lie over them.
  for (const l of lines) {
    const y1 = yOf(Math.max(l.low, l.high));
    const y2 = yOf(Math.min(l.low, l.high));
    out.push(
      `<rect class="band" data-kind="${l.kind}" data-low="${l.low}" data-high="${l.high}" x="${f(left)}" y="${f(y1)}" width="${f(plotW)}" height="${f(Math.max(0.5, y2 - y1))}" fill="${l.kind === 'mean' ? MEAN_BAND : LIMIT_BAND}" stroke="none"/>`,
    );
  }
  // Value grid and its tick labels.
  for (const [k, t] of yTicks.ticks.entries()) {
    const y = yOf(t);
    if (y < top - 0.01 || y > bottom + 0.01) continue;
    out.push(`<line class="grid" x1="${f(left)}" y1="${f(y)}" x2="${f(right)}" y2="${f(y)}" stroke="#ececec" stroke-width="1"/>`);
    out.push(`<text class="tick" x="${f(left - 4)}" y="${f(y + fsText * 0.35)}" font-size="${fsText}" text-anchor="end" fill="#404040">${yTickTexts[k]}</text>`);
  }
  if (yLo < 0 && yHi > 0) out.push(`<line class="zero" data-value="0" x1="${f(left)}" y1="${f(yOf(0))}" x2="${f(right)}" y2="${f(yOf(0))}" stroke="${ZERO_INK}" stroke-width="0.8"/>`);
  for (const l of lines) {
    const y = yOf(l.value);
    const dash = l.kind === 'mean' ? '' : ' stroke-dasharray="6 3"';
    out.push(`<line class="agreement-line" data-kind="${l.kind}" data-value="${l.value}" x1="${f(left)}" y1="${f(y)}" x2="${f(right)}" y2="${f(y)}" stroke="${l.kind === 'mean' ? MEAN_INK : LIMIT_INK}" stroke-width="1.4"${dash}/>`);
  }
  out.push(`<rect class="frame" x="${f(left)}" y="${f(top)}" width="${f(plotW)}" height="${f(plotH)}" fill="none" stroke="#b0b0b0" stroke-width="1"/>`);
  for (const p of points) {
    const tip = `${p.pair.label ? `${p.pair.label}: ` : ''}x ${p.pair.x}, y ${p.pair.y}; mean ${showValue(p.mean)}, difference ${showValue(p.d)}${scale === 'percent' ? ' %' : ''}`;
    out.push(
      `<circle class="point" data-index="${p.index}" data-mean="${p.mean}" data-difference="${p.d}" cx="${f(xOf(p.mean))}" cy="${f(yOf(p.d))}" r="${f(r)}" fill="${POINT_INK}" fill-opacity="0.75" stroke="${POINT_INK}" stroke-width="0.6"><title>${escapeXml(tip)}</title></circle>`,
    );
  }
  if (points.length === 0) out.push(`<text class="empty" x="${f(left + plotW / 2)}" y="${f(top + plotH / 2)}" font-size="${fsText}" text-anchor="middle" fill="#404040">No pairs</text>`);
  out.push(`</g>`);

  // Names of the lines in the right margin, spread apart so they never overlap.
  const labelYs = spread(
    lines.map((l) => yOf(l.value) + fsText * 0.35),
    fsText + 2,
    top + fsText,
    bottom + fsText * 0.35,
  );
  out.push(`<g class="line-labels">`);
  lines.forEach((l, k) => {
    out.push(`<text class="line-label" data-kind="${l.kind}" x="${f(right + 4)}" y="${f(labelYs[k])}" font-size="${fsText}" fill="${l.kind === 'mean' ? MEAN_INK : LIMIT_INK}">${escapeXml(lineTexts[k])}</text>`);
  });
  out.push(`</g>`);

  // Mean axis: ticks and name; the difference axis name turned along the left edge.
  const xTicks = niceTicks(xLo, xHi, Math.max(3, Math.floor(plotW / (fsText * 4))));
  out.push(`<g class="x-axis">`);
  for (const t of xTicks.ticks) {
    const x = xOf(t);
    if (x < left - 0.01 || x > right + 0.01) continue;
    out.push(`<line x1="${f(x)}" y1="${f(bottom)}" x2="${f(x)}" y2="${f(bottom + 3)}" stroke="#808080" stroke-width="1"/>`);
    out.push(`<text class="tick" x="${f(x)}" y="${f(bottom + 4 + fsText)}" font-size="${fsText}" text-anchor="middle" fill="#404040">${tickText(t, xTicks.step)}</text>`);
  }
  out.push(
    `<text class="axis-name" x="${f(left + plotW / 2)}" y="${f(bottom + 6 + 2 * fsText + 2)}" font-size="${fsText}" text-anchor="middle" fill="#404040">${escapeXml(cut(meanName, fits(plotW, fsText)))}</text>`,
  );
  out.push(`</g>`);
  const yName = cut(diffName, fits(plotH, fsText));
  out.push(
    `<text class="axis-name" x="${f(pad + fsText)}" y="${f(top + plotH / 2)}" font-size="${fsText}" text-anchor="middle" fill="#404040" transform="rotate(-90 ${f(pad + fsText)} ${f(top + plotH / 2)})">${escapeXml(yName)}</text>`,
  );

  // Key.
  out.push(`<g class="key">`);
  keyEntries.forEach((e, k) => {
    const { x, row } = keyPlaced[k];
    const cy = keyTop + row * keyRow + keyRow / 2;
    const mark =
      e.kind === 'mean'
        ? `<line x1="${f(x)}" y1="${f(cy)}" x2="${f(x + sample)}" y2="${f(cy)}" stroke="${MEAN_INK}" stroke-width="1.4"/>`
        : e.kind === 'limit'
          ? `<line x1="${f(x)}" y1="${f(cy)}" x2="${f(x + sample)}" y2="${f(cy)}" stroke="${LIMIT_INK}" stroke-width="1.4" stroke-dasharray="6 3"/>`
          : `<rect x="${f(x)}" y="${f(cy - 4)}" width="${f(sample)}" height="8.00" fill="${LIMIT_BAND}" stroke="none"/>`;
    out.push(`<g class="key-entry" data-key="${e.kind}">${mark}<text x="${f(x + sample + 4)}" y="${f(cy + fsText * 0.35)}" font-size="${fsText}" fill="#202020">${escapeXml(cut(e.text, fits(W - pad - x - sample - 4, fsText)))}</text></g>`);
  });
  out.push(`</g>`);
  out.push(`</svg>`);
  return out.join('\n');
}
