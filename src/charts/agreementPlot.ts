/**
 * The difference plot of a method comparison (Bland–Altman), as an SVG document in a string:
 * each pair's difference (candidate − comparative, or in % of the pair's mean) against the
 * pair's mean, a line at zero, the mean difference and the two limits of agreement, each with
 * a shaded band for its confidence interval and its value written at the right edge.
 *
 * The figures (mean difference, limits and their intervals) are DATA.AGREEMENT's, handed in; the
 * drawing computes nothing but positions. A pure function: no DOM, no Node, no fonts measured
 * (text is cut to a character count from a generous width per character, as the control
 * chart does). <title> and <desc> with role="img" give screen readers the figures, the number
 * of pairs and the pairs outside the limits. Marks carry data-* attributes (the full-precision
 * values) so the drawing can be checked against the data.
 */
import { cut, escapeXml } from './controlChart';

export interface AgreementPoint {
  /** (x + y)/2. */
  readonly mean: number;
  /** y − x, or 100·(y − x)/((x + y)/2). */
  readonly difference: number;
  /** Text for the point's tooltip (e.g. the sheet row). */
  readonly label?: string;
}

/** A figure with its confidence interval. */
export interface Band {
  readonly value: number;
  readonly low: number;
  readonly high: number;
}

export interface AgreementPlotInput {
  readonly title: string;
  readonly points: readonly AgreementPoint[];
  readonly meanDifference: Band;
  readonly lower: Band;
  readonly upper: Band;
  /** "percent": differences in % of the pair's mean; "absolute": in the unit of the results. */
  readonly scale: 'absolute' | 'percent';
  /** Width in px: 288 fits the task pane; 600–1200 for print. Default 288, accepted 200–4000. */
  readonly width?: number;
  /** Prefix of the ids of <title> and <desc>. */
  readonly id?: string;
}

const CHAR_EM = 0.62;
const POINT_INK = '#24527a';
const MEAN_INK = '#3d6b45';
const LIMIT_INK = '#8a4b16';
const BAND_OPACITY = '0.12';

function f(x: number): string {
  const s = x.toFixed(2);
  return s === '-0.00' ? '0.00' : s;
}

/** A figure for a label: 3 significant digits, a true minus sign. */
export function showFigure(x: number): string {
  const a = Math.abs(x);
  const s = a === 0 ? '0' : a >= 1000 || a < 0.01 ? x.toPrecision(3) : x.toFixed(Math.max(0, 2 - Math.floor(Math.log10(a))));
  return s.replace('-', '−');
}

/** Tick values: steps of 1, 2 or 5 × 10^k covering [lo, hi], at most `most`. */
function ticks(lo: number, hi: number, most: number): number[] {
  const span = hi - lo || Math.abs(hi) || 1;
  const raw = span / Math.max(1, most - 1);
  const p = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 5, 10].map((m) => m * p).find((s) => s >= raw) ?? 10 * p;
  const out: number[] = [];
  for (let t = Math.ceil(lo / step) * step; t <= hi + step * 1e-9; t += step) out.push(Math.abs(t) < step * 1e-9 ? 0 : t);
  return out;
}

function tickText(t: number, step: number): string {
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  return t.toFixed(Math.min(6, decimals)).replace('-', '−');
}

/** The plot as SVG text. Throws a RangeError for a width outside 200–4000 px or a non-finite input. */
export function agreementPlotSvg(input: AgreementPlotInput): string {
  const W = input.width ?? 288;
  if (!(W >= 200 && W <= 4000)) throw new RangeError(`plot width must be 200 to 4000 px (got ${W})`);
  const bands = [input.lower, input.meanDifference, input.upper];
  for (const b of bands) if (![b.value, b.low, b.high].every(Number.isFinite)) throw new RangeError('the limits and their intervals must be finite numbers');
  for (const p of input.points) if (!Number.isFinite(p.mean) || !Number.isFinite(p.difference)) throw new RangeError(`a point has mean ${p.mean} and difference ${p.difference}: both must be finite`);
  const id = (input.id ?? 'leeway-agreement').replace(/[^A-Za-z0-9_-]/g, '-');
  const wide = W >= 480;
  const fsTitle = wide ? 15 : 12;
  const fsText = wide ? 11 : 9;
  const r = wide ? 3.2 : 2.6;
  const pad = 8;
  const unit = input.scale === 'percent' ? '%' : '';

  // The y range holds every point, zero and every band end, with a little room.
  const ys = [0, ...input.points.map((p) => p.difference), ...bands.flatMap((b) => [b.low, b.high])];
  let yLo = Math.min(...ys);
  let yHi = Math.max(...ys);
  const ySpan = yHi - yLo || Math.abs(yHi) || 1;
  yLo -= ySpan * 0.06;
  yHi += ySpan * 0.06;
  const xsData = input.points.map((p) => p.mean);
  let xLo = xsData.length ? Math.min(...xsData) : 0;
  let xHi = xsData.length ? Math.max(...xsData) : 1;
  const xSpan = xHi - xLo || Math.abs(xHi) || 1;
  xLo -= xSpan * 0.04;
  xHi += xSpan * 0.04;

  const yTicks = ticks(yLo, yHi, 6);
  const yStep = yTicks.length > 1 ? yTicks[1] - yTicks[0] : ySpan;
  const yTickTexts = yTicks.map((t) => tickText(t, yStep));
  const labelChars = Math.max(...yTickTexts.map((t) => t.length), 2);
  const bandLabels = [
    { b: input.upper, name: 'upper' },
    { b: input.meanDifference, name: 'mean' },
    { b: input.lower, name: 'lower' },
  ].map((x) => ({ ...x, text: `${x.name} ${showFigure(x.b.value)}${unit}` }));
  const rightChars = Math.max(...bandLabels.map((x) => x.text.length));
  const top = pad + fsTitle + 10;
  const left = pad + fsText + 6 + labelChars * CHAR_EM * fsText + 4;
  const right = W - pad - rightChars * CHAR_EM * fsText - 4;
  const plotH = Math.round(Math.min(380, Math.max(140, W * 0.55)));
  const bottom = top + plotH;
  const H = Math.round(bottom + 2 * fsText + 16 + pad);
  const xOf = (v: number): number => left + ((v - xLo) / (xHi - xLo)) * (right - left);
  const yOf = (v: number): number => top + ((yHi - v) / (yHi - yLo)) * plotH;

  const outside = input.points.filter((p) => p.difference < input.lower.value || p.difference > input.upper.value);
  const show = (b: Band): string => `${showFigure(b.value)}${unit} (95 % CI ${showFigure(b.low)} to ${showFigure(b.high)})`;
  const desc =
    input.points.length === 0
      ? 'No pairs to show.'
      : `${input.points.length} pairs: the difference ${input.scale === 'percent' ? 'in % of the pair’s mean' : 'y − x'} against the mean of the pair. ` +
        `Mean difference ${show(input.meanDifference)}; lower limit of agreement ${show(input.lower)}; upper limit ${show(input.upper)}. ` +
        (outside.length === 0 ? 'No pair lies outside the limits.' : `${outside.length} pair${outside.length === 1 ? '' : 's'} outside the limits.`);

  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" ` +
      `aria-label="${escapeXml(input.title)}" aria-describedby="${id}-desc" font-family="sans-serif">`,
  );
  out.push(`<title id="${id}-title">${escapeXml(input.title)}</title>`);
  out.push(`<desc id="${id}-desc">${escapeXml(desc)}</desc>`);
  out.push(`<rect class="background" x="0.00" y="0.00" width="${f(W)}" height="${f(H)}" fill="#ffffff"/>`);
  out.push(
    `<text class="title" x="${f(pad)}" y="${f(pad + fsTitle)}" font-size="${fsTitle}" font-weight="bold" fill="#202020">` +
      `${escapeXml(cut(input.title, Math.floor((W - 2 * pad) / (CHAR_EM * fsTitle))))}</text>`,
  );
  out.push(`<rect class="frame" x="${f(left)}" y="${f(top)}" width="${f(right - left)}" height="${f(plotH)}" fill="none" stroke="#b0b0b0" stroke-width="1"/>`);

  // Axes: ticks and names.
  out.push(`<g class="y-axis">`);
  yTicks.forEach((t, i) => {
    const y = yOf(t);
    out.push(`<line x1="${f(left - 3)}" y1="${f(y)}" x2="${f(left)}" y2="${f(y)}" stroke="#808080" stroke-width="1"/>`);
    out.push(`<text class="tick" x="${f(left - 5)}" y="${f(y + fsText * 0.35)}" font-size="${fsText}" text-anchor="end" fill="#404040">${yTickTexts[i]}</text>`);
  });
  const yName = input.scale === 'percent' ? 'Difference, % of mean' : 'Difference (y − x)';
  out.push(
    `<text class="axis-name" transform="translate(${f(pad + fsText)} ${f(top + plotH / 2)}) rotate(-90)" font-size="${fsText}" text-anchor="middle" fill="#404040">${escapeXml(cut(yName, Math.floor(plotH / (CHAR_EM * fsText))))}</text>`,
  );
  out.push(`</g><g class="x-axis">`);
  const xTicks = ticks(xLo, xHi, Math.max(2, Math.floor((right - left) / (fsText * 5))));
  const xStep = xTicks.length > 1 ? xTicks[1] - xTicks[0] : xSpan;
  for (const t of xTicks) {
    const x = xOf(t);
    out.push(`<line x1="${f(x)}" y1="${f(bottom)}" x2="${f(x)}" y2="${f(bottom + 3)}" stroke="#808080" stroke-width="1"/>`);
    out.push(`<text class="tick" x="${f(x)}" y="${f(bottom + 4 + fsText)}" font-size="${fsText}" text-anchor="middle" fill="#404040">${tickText(t, xStep)}</text>`);
  }
  out.push(`<text class="axis-name" x="${f((left + right) / 2)}" y="${f(bottom + 8 + 2 * fsText)}" font-size="${fsText}" text-anchor="middle" fill="#404040">Mean of the pair</text>`);
  out.push(`</g>`);

  // Zero, then the three bands and their lines, labelled at the right edge.
  if (yLo < 0 && yHi > 0) out.push(`<line class="zero" x1="${f(left)}" y1="${f(yOf(0))}" x2="${f(right)}" y2="${f(yOf(0))}" stroke="#a0a0a0" stroke-width="1"/>`);
  const placedY: number[] = [];
  for (const { b, name, text } of bandLabels) {
    const ink = name === 'mean' ? MEAN_INK : LIMIT_INK;
    const dash = name === 'mean' ? '' : ` stroke-dasharray="6 3"`;
    out.push(
      `<g class="band" data-band="${name}" data-value="${String(b.value)}" data-low="${String(b.low)}" data-high="${String(b.high)}">` +
        `<rect x="${f(left)}" y="${f(yOf(b.high))}" width="${f(right - left)}" height="${f(Math.max(0.5, yOf(b.low) - yOf(b.high)))}" fill="${ink}" fill-opacity="${BAND_OPACITY}"/>` +
        `<line x1="${f(left)}" y1="${f(yOf(b.value))}" x2="${f(right)}" y2="${f(yOf(b.value))}" stroke="${ink}" stroke-width="1.4"${dash}/>`,
    );
    // Labels keep a line's height apart (the mean can sit close to a limit).
    let ly = yOf(b.value) + fsText * 0.35;
    for (const py of placedY) if (Math.abs(ly - py) < fsText + 1) ly = py + fsText + 1;
    placedY.push(ly);
    out.push(`<text class="band-label" x="${f(right + 4)}" y="${f(ly)}" font-size="${fsText}" fill="${ink}">${escapeXml(text)}</text></g>`);
  }

  out.push(`<g class="points">`);
  input.points.forEach((p, i) => {
    const off = p.difference < input.lower.value || p.difference > input.upper.value;
    const tip = `${p.label ? `${p.label}: ` : ''}mean ${showFigure(p.mean)}, difference ${showFigure(p.difference)}${unit}${off ? ' (outside the limits)' : ''}`;
    out.push(
      `<circle class="point${off ? ' outside' : ''}" data-index="${i}" data-mean="${String(p.mean)}" data-difference="${String(p.difference)}" ` +
        `cx="${f(xOf(p.mean))}" cy="${f(yOf(p.difference))}" r="${f(off ? r + 1 : r)}" fill="${off ? '#ffffff' : POINT_INK}" fill-opacity="${off ? '1' : '0.8'}" stroke="${POINT_INK}" stroke-width="${off ? '1.6' : '0.8'}"><title>${escapeXml(tip)}</title></circle>`,
    );
  });
  out.push(`</g>`);
  out.push(`</svg>`);
  return out.join('\n');
}
