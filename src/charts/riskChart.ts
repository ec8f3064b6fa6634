/**
 * The risk chart of a QC procedure, as an SVG document in a string: the expected number of
 * unreliable final patient results, E(Nuf), against the size of a systematic shift (SD of the
 * method), for one control rule, number of controls and run size. The curve's maximum — QC.RISK —
 * is ringed and dropped to the shift axis; the acceptable risk (1 by default) is a dashed line,
 * so a curve rising above it shows at a glance that the run size is too long.
 *
 * A pure function of its input: no DOM, no Node, no fonts measured (text sizes in px, generic
 * sans-serif, texts cut to a count of characters from a generous width per character, as the
 * control chart does). Coordinates have two decimals; text is escaped. The curve carries its
 * numbers (data-shifts, data-risks) and the maximum its own (data-max-risk, data-argmax) at full
 * precision, so the drawing can be checked against the engine. <title> and <desc> say in words
 * what the chart shows, for screen readers.
 */
import { CHAR_EM, cut, escapeXml, f, fits } from './text';

export interface RiskChartPoint {
  /** Shift, SD of the method (≥ 0). */
  readonly shift: number;
  /** E(Nuf) at that shift (≥ 0). */
  readonly risk: number;
}

export interface RiskChartInput {
  readonly title: string;
  /** The procedure in words, e.g. "1-3s, n=2". */
  readonly procedure: string;
  /** Patient results between QC events. */
  readonly runSize: number;
  /** E(Nuf) over the shifts, ascending in shift. */
  readonly points: readonly RiskChartPoint[];
  /** The maximum (QC.RISK) and the shift where it occurs. */
  readonly maxRisk: number;
  readonly argmax: number;
  /** The acceptable maximum (default 1). */
  readonly limit?: number;
  /** Width in px: 288 fits the task pane. Default 288, accepted 200–4000. */
  readonly width?: number;
  /** Prefix of the ids of <title> and <desc>, unique per page. */
  readonly id?: string;
}

const INK = { curve: '#1d4f73', area: '#dbe7f0', peak: '#8a2a0a', limit: '#5c5c5c', axis: '#404040', frame: '#b0b0b0', grid: '#e4e4e4' };

/** A count of unreliable results as a reader wants it: three significant digits, no exponent below 1e6. */
export function showRisk(x: number): string {
  if (x === 0) return '0';
  if (x >= 1e6) return x.toExponential(2).replace('e+', 'e');
  if (x >= 100) return String(Math.round(x));
  return String(Number(x.toPrecision(3)));
}

/** A tidy top for the risk axis: 1, 2, 2.5 or 5 times a power of ten, at least `x`. */
export function riskAxisTop(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) return 1;
  const p = Math.pow(10, Math.floor(Math.log10(x)));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= x * (1 - 1e-12)) return m * p;
  return 10 * p;
}

function check(input: RiskChartInput): void {
  const W = input.width ?? 288;
  if (!(W >= 200 && W <= 4000)) throw new RangeError(`chart width must be 200 to 4000 px (got ${W})`);
  for (const p of input.points) {
    if (!(Number.isFinite(p.shift) && p.shift >= 0 && Number.isFinite(p.risk) && p.risk >= 0)) {
      throw new RangeError(`risk chart point (${p.shift}, ${p.risk}): shift and risk must be finite numbers ≥ 0`);
    }
  }
  if (!(Number.isFinite(input.maxRisk) && input.maxRisk >= 0 && Number.isFinite(input.argmax) && input.argmax >= 0)) {
    throw new RangeError(`risk chart maximum (${input.maxRisk} at ${input.argmax}): both must be finite numbers ≥ 0`);
  }
}

/** What the chart shows, in words (its <desc>, and the pane's text equivalent). */
export function riskChartText(input: RiskChartInput): string {
  const limit = input.limit ?? 1;
  const verdict = input.maxRisk > limit ? `above the acceptable ${showRisk(limit)}` : `within the acceptable ${showRisk(limit)}`;
  return (
    `Expected unreliable final results against the size of a systematic shift, for ${input.procedure} with ${input.runSize} patient result${input.runSize === 1 ? '' : 's'} between QC events. ` +
    `Largest ${showRisk(input.maxRisk)} at a shift of ${input.argmax.toFixed(2)} SD: ${verdict}.`
  );
}

interface Frame {
  readonly W: number;
  readonly H: number;
  readonly x0: number;
  readonly x1: number;
  readonly y0: number;
  readonly y1: number;
  readonly xMax: number;
  readonly yTop: number;
  readonly fs: number;
  readonly fsTitle: number;
  readonly pad: number;
}

function frameOf(input: RiskChartInput): Frame {
  const W = input.width ?? 288;
  const wide = W >= 480;
  const fs = wide ? 11 : 9;
  const fsTitle = wide ? 15 : 12;
  const pad = 8;
  const yTop = riskAxisTop(Math.max(input.maxRisk, input.limit ?? 1) * 1.08);
  const labelW = Math.max(...[0, 0.5, 1].map((k) => showRisk(k * yTop).length)) * CHAR_EM * fs;
  const x0 = pad + labelW + 6;
  // Title, the procedure line, the name of the risk axis, then the plot.
  const y0 = pad + fsTitle + 6 + fs + 6 + fs + 6;
  const plotH = Math.round(Math.min(360, Math.max(120, W * 0.45)));
  const xMax = Math.max(1, ...input.points.map((p) => p.shift), input.argmax);
  return { W, H: y0 + plotH + 2 * fs + 14 + pad, x0, x1: W - pad - 4, y0, y1: y0 + plotH, xMax, yTop, fs, fsTitle, pad };
}

function axes(fr: Frame): string[] {
  const xOf = (v: number): number => fr.x0 + (v / fr.xMax) * (fr.x1 - fr.x0);
  const yOf = (v: number): number => fr.y1 - (v / fr.yTop) * (fr.y1 - fr.y0);
  const out: string[] = [`<g class="axes">`];
  for (const k of [0, 0.25, 0.5, 0.75, 1]) {
    const y = yOf(k * fr.yTop);
    out.push(`<line class="grid" x1="${f(fr.x0)}" y1="${f(y)}" x2="${f(fr.x1)}" y2="${f(y)}" stroke="${INK.grid}" stroke-width="1"/>`);
    if (k === 0 || k === 0.5 || k === 1) {
      out.push(`<text class="tick" x="${f(fr.x0 - 4)}" y="${f(y + fr.fs * 0.35)}" font-size="${fr.fs}" text-anchor="end" fill="${INK.axis}">${escapeXml(showRisk(k * fr.yTop))}</text>`);
    }
  }
  const step = fr.xMax > 6 ? 2 : 1;
  for (let t = 0; t <= fr.xMax + 1e-9; t += step) {
    const x = xOf(t);
    out.push(`<line x1="${f(x)}" y1="${f(fr.y1)}" x2="${f(x)}" y2="${f(fr.y1 + 3)}" stroke="#808080" stroke-width="1"/>`);
    out.push(`<text class="tick" x="${f(x)}" y="${f(fr.y1 + 4 + fr.fs)}" font-size="${fr.fs}" text-anchor="middle" fill="${INK.axis}">${t}</text>`);
  }
  out.push(`<rect class="frame" x="${f(fr.x0)}" y="${f(fr.y0)}" width="${f(fr.x1 - fr.x0)}" height="${f(fr.y1 - fr.y0)}" fill="none" stroke="${INK.frame}" stroke-width="1"/>`);
  out.push(`<text class="axis-name" x="${f((fr.x0 + fr.x1) / 2)}" y="${f(fr.y1 + 8 + 2 * fr.fs)}" font-size="${fr.fs}" text-anchor="middle" fill="${INK.axis}">Systematic shift, SD</text>`);
  out.push(`<text class="axis-name" x="${f(fr.pad)}" y="${f(fr.y0 - 6)}" font-size="${fr.fs}" fill="${INK.axis}">${escapeXml(cut('Unreliable final results, expected', fits(fr.W - 2 * fr.pad, fr.fs)))}</text>`);
  out.push(`</g>`);
  return out;
}

function curve(input: RiskChartInput, fr: Frame): string[] {
  const xOf = (v: number): number => fr.x0 + (v / fr.xMax) * (fr.x1 - fr.x0);
  const yOf = (v: number): number => fr.y1 - (Math.min(v, fr.yTop) / fr.yTop) * (fr.y1 - fr.y0);
  const pts = input.points;
  const out: string[] = [];
  if (pts.length) {
    const line = pts.map((p, i) => `${i === 0 ? 'M' : 'L'}${f(xOf(p.shift))} ${f(yOf(p.risk))}`).join('');
    const area = `${line}L${f(xOf(pts[pts.length - 1].shift))} ${f(fr.y1)}L${f(xOf(pts[0].shift))} ${f(fr.y1)}Z`;
    out.push(`<path class="risk-area" d="${area}" fill="${INK.area}" stroke="none"/>`);
    out.push(
      `<path class="risk-curve" d="${line}" fill="none" stroke="${INK.curve}" stroke-width="2" stroke-linejoin="round" ` +
        `data-shifts="${pts.map((p) => String(p.shift)).join(',')}" data-risks="${pts.map((p) => String(p.risk)).join(',')}"/>`,
    );
  }
  const limit = input.limit ?? 1;
  const ly = yOf(limit);
  out.push(`<line class="risk-limit" data-limit="${limit}" x1="${f(fr.x0)}" y1="${f(ly)}" x2="${f(fr.x1)}" y2="${f(ly)}" stroke="${INK.limit}" stroke-width="1.2" stroke-dasharray="6 3"/>`);
  // Below the line at its right end: the peak's label sits above the peak, so the two never meet.
  out.push(`<text class="limit-label" x="${f(fr.x1 - 3)}" y="${f(Math.min(fr.y1 - 3, ly + fr.fs + 2))}" font-size="${fr.fs}" text-anchor="end" fill="${INK.limit}">acceptable ${escapeXml(showRisk(limit))}</text>`);
  return out;
}

function peak(input: RiskChartInput, fr: Frame): string[] {
  const x = fr.x0 + (input.argmax / fr.xMax) * (fr.x1 - fr.x0);
  const y = fr.y1 - (Math.min(input.maxRisk, fr.yTop) / fr.yTop) * (fr.y1 - fr.y0);
  const text = `max ${showRisk(input.maxRisk)} at ${input.argmax.toFixed(1)} SD`;
  const w = text.length * CHAR_EM * fr.fs;
  // The label sits beside the mark, on the side with room, and below the top edge.
  const right = x + 8 + w <= fr.x1 - 2;
  const tx = right ? x + 7 : x - 7;
  const ty = Math.max(fr.y0 + fr.fs + 2, y - 6);
  return [
    `<g class="risk-peak" data-max-risk="${String(input.maxRisk)}" data-argmax="${String(input.argmax)}" data-run-size="${input.runSize}">`,
    `<line x1="${f(x)}" y1="${f(y)}" x2="${f(x)}" y2="${f(fr.y1)}" stroke="${INK.peak}" stroke-width="1" stroke-dasharray="2 2"/>`,
    `<circle cx="${f(x)}" cy="${f(y)}" r="4" fill="#ffffff" stroke="${INK.peak}" stroke-width="2"/>`,
    `<text class="peak-label" x="${f(tx)}" y="${f(ty)}" font-size="${fr.fs}" font-weight="bold" text-anchor="${right ? 'start' : 'end'}" fill="${INK.peak}">${escapeXml(text)}</text>`,
    `</g>`,
  ];
}

/**
 * The chart as an SVG document (a string starting with "<svg"). Throws a RangeError for a width
 * outside 200–4000 px, or a point or maximum that is not a finite number ≥ 0.
 */
export function riskChartSvg(input: RiskChartInput): string {
  check(input);
  const fr = frameOf(input);
  const id = (input.id ?? 'leeway-risk-chart').replace(/[^A-Za-z0-9_-]/g, '-');
  const title = input.title;
  const sub = `${input.procedure} · run size ${input.runSize}`;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" class="risk-chart" width="${fr.W}" height="${fr.H}" viewBox="0 0 ${fr.W} ${fr.H}" role="img" ` +
      `aria-labelledby="${id}-title" aria-describedby="${id}-desc" font-family="sans-serif">`,
    `<title id="${id}-title">${escapeXml(`${title} — ${sub}`)}</title>`,
    `<desc id="${id}-desc">${escapeXml(riskChartText(input))}</desc>`,
    `<rect class="background" x="0.00" y="0.00" width="${f(fr.W)}" height="${f(fr.H)}" fill="#ffffff"/>`,
    `<text class="title" x="${f(fr.pad)}" y="${f(fr.pad + fr.fsTitle)}" font-size="${fr.fsTitle}" font-weight="bold" fill="#202020">${escapeXml(cut(title, fits(fr.W - 2 * fr.pad, fr.fsTitle)))}</text>`,
    `<text class="procedure" x="${f(fr.pad)}" y="${f(fr.pad + fr.fsTitle + 6 + fr.fs)}" font-size="${fr.fs}" fill="#303030">${escapeXml(cut(sub, fits(fr.W - 2 * fr.pad, fr.fs)))}</text>`,
    ...axes(fr),
    ...curve(input, fr),
    ...peak(input, fr),
    `</svg>`,
  ].join('');
}
