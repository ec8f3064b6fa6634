/**
 * The control chart of a period of control results, as an SVG document in a string.
 *
 * Results are drawn in SD units from their target (z) against their position in run order, one
 * line and one marker shape per control material, with horizontal lines at the target (0) and at
 * ±1, ±2 and ±3 SD. Each flagged result is ringed and labelled with the control-rule terms it
 * completes. A result beyond ±4.5 SD is drawn on the edge of the plot with an arrow pointing off
 * it. A legend names the materials; <title> and <desc> and the role/aria attributes describe the
 * chart to screen readers.
 *
 * A pure function of its input: no DOM, no Node, no fonts measured. Text is sized in pixels with
 * the generic "sans-serif" family, and every text that must fit a space is cut to a number of
 * characters computed from a generous width per character (0.62 em), so the drawing does not
 * depend on which sans-serif font is installed. All coordinates have two decimals; all text is
 * escaped. Marks carry data-* attributes (z at full precision, flags, material, index) so the
 * drawing can be checked against the data. Shared by the task pane (inline SVG) and the command
 * line (SVG, or PNG through an SVG renderer).
 */
import type { ControlEvaluation } from '../engine/qc/flags';
import { cut, escapeXml, f, fits, flowKey, textWidth } from './text';

// Shared with the other charts; kept importable from here.
export { cut, escapeXml };

/** One control result on the chart. */
export interface ChartPoint {
  /** Position in run order (the x axis), ascending within a material. */
  readonly index: number;
  /** (value − target)/sd. */
  readonly z: number;
  /** The terms the result completes, joined by "/"; "" for none. */
  readonly flags: string;
  /** Optional text for the point's tooltip (a run label or a date). */
  readonly label?: string;
}

/** One control material: its name and its results. */
export interface ChartSeries {
  readonly name: string;
  readonly points: readonly ChartPoint[];
}

export interface ControlChartInput {
  readonly title: string;
  readonly series: readonly ChartSeries[];
  /** Width in px: 288 fits the task pane; 600–1200 for print. Default 288, accepted 200–4000. */
  readonly width?: number;
  /** Prefix of the ids of <title> and <desc>, unique per page when several charts are shown. */
  readonly id?: string;
}

/** The edge of the plot in SD: results beyond it are drawn on the edge. */
export const Z_EDGE = 4.5;

/** Width per character, as a share of the font size, used to cut text (generous for sans-serif). */
/** A restrained palette of dark, distinguishable tones (chosen for this chart). */
const INK = ['#24527a', '#8a4b16', '#3d6b45', '#6b4a86', '#505050', '#7a2f3b'];
const FLAG_INK = '#a01e1e';
const GRID = { zero: '#4a4a4a', one: '#c8c8c8', two: '#8c8c8c', three: '#5c5c5c' };

type Shape = (x: number, y: number, r: number) => string;

/** Marker outlines, centred on (x, y), of about the same visual weight. */
const SHAPES: Shape[] = [
  // circle
  (x, y, r) => `M${f(x - r)} ${f(y)}A${f(r)} ${f(r)} 0 1 0 ${f(x + r)} ${f(y)}A${f(r)} ${f(r)} 0 1 0 ${f(x - r)} ${f(y)}Z`,
  // square
  (x, y, r) => {
    const s = r * 0.88;
    return `M${f(x - s)} ${f(y - s)}H${f(x + s)}V${f(y + s)}H${f(x - s)}Z`;
  },
  // triangle, point up
  (x, y, r) => `M${f(x)} ${f(y - r * 1.15)}L${f(x + r * 1.05)} ${f(y + r * 0.75)}H${f(x - r * 1.05)}Z`,
  // diamond
  (x, y, r) => `M${f(x)} ${f(y - r * 1.25)}L${f(x + r * 1.05)} ${f(y)}L${f(x)} ${f(y + r * 1.25)}L${f(x - r * 1.05)} ${f(y)}Z`,
  // triangle, point down
  (x, y, r) => `M${f(x - r * 1.05)} ${f(y - r * 0.75)}H${f(x + r * 1.05)}L${f(x)} ${f(y + r * 1.15)}Z`,
  // plus
  (x, y, r) => {
    const a = r * 1.15;
    const b = r * 0.38;
    return (
      `M${f(x - b)} ${f(y - a)}H${f(x + b)}V${f(y - b)}H${f(x + a)}V${f(y + b)}H${f(x + b)}V${f(y + a)}` +
      `H${f(x - b)}V${f(y + b)}H${f(x - a)}V${f(y - b)}H${f(x - b)}Z`
    );
  },
];

function showZ(z: number): string {
  const s = z.toFixed(2);
  return (z > 0 ? '+' : '') + (s === '-0.00' ? '0.00' : s).replace('-', '−');
}

function sdLabel(k: number): string {
  if (k === 0) return '0';
  return `${k > 0 ? '+' : '−'}${Math.abs(k)} SD`;
}

/** Tick positions on the run-order axis: steps of 1, 2 or 5 × 10^k, at most `most` of them. */
function ticks(lo: number, hi: number, most: number): number[] {
  const span = Math.max(hi - lo, 1);
  let step = 1;
  for (let p = 1; ; p *= 10) {
    const s = [1, 2, 5].map((m) => m * p).find((c) => Math.floor(hi / c) - Math.ceil(lo / c) + 1 <= most);
    if (s !== undefined) {
      step = s;
      break;
    }
    if (p > span * 10) break;
  }
  const out: number[] = [];
  for (let t = Math.ceil(lo / step) * step; t <= hi + 1e-9; t += step) out.push(t);
  return out;
}

interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

function overlap(a: Box, b: Box): number {
  const w = Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x);
  const h = Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y);
  return w > 0 && h > 0 ? w * h : 0;
}

function inside(a: Box, area: Box): boolean {
  return a.x >= area.x && a.y >= area.y && a.x + a.w <= area.x + area.w && a.y + a.h <= area.y + area.h;
}

/**
 * The chart as an SVG document (a string starting with "<svg"). Throws a RangeError for a width
 * outside 200–4000 px or a z that is not a finite number.
 */
export function controlChartSvg(input: ControlChartInput): string {
  const W = input.width ?? 288;
  if (!(W >= 200 && W <= 4000)) throw new RangeError(`chart width must be 200 to 4000 px (got ${W})`);
  const id = (input.id ?? 'leeway-qc-chart').replace(/[^A-Za-z0-9_-]/g, '-');
  const series = input.series.filter((s) => s.points.length > 0);
  for (const s of series) {
    for (const p of s.points) {
      if (!Number.isFinite(p.z) || !Number.isFinite(p.index)) {
        throw new RangeError(`chart point of "${s.name}" at ${p.index} has z ${p.z}: z and index must be finite numbers`);
      }
    }
  }
  const wide = W >= 480;
  const fsTitle = wide ? 15 : 12;
  const fsText = wide ? 11 : 9;
  const fsFlag = wide ? 10 : 8.5;
  const marker = wide ? 4 : 3;
  const pad = 8;

  // Legend: one entry per material (line sample, marker, name), then the keys of the marks in use.
  const nameChars = wide ? 28 : 16;
  const entries: Array<{ kind: 'material' | 'flag' | 'clamp'; text: string; s: number }> = series.map((s, i) => ({
    kind: 'material',
    text: cut(s.name === '' ? 'Control results' : s.name, nameChars),
    s: i,
  }));
  const anyFlag = series.some((s) => s.points.some((p) => p.flags !== ''));
  const anyClamp = series.some((s) => s.points.some((p) => Math.abs(p.z) > Z_EDGE));
  if (anyFlag) entries.push({ kind: 'flag', text: 'flagged result', s: -1 });
  if (anyClamp) entries.push({ kind: 'clamp', text: `beyond ±${Z_EDGE} SD (on the edge)`, s: -1 });
  const sample = 22;
  const legendRow = fsText + 7;
  const { placed, rows: legendRows } = flowKey(entries.map((e) => sample + 4 + textWidth(e.text, fsText) + 12), pad, W - pad);

  // Frame: title on top, SD labels at the left, run-order ticks, axis name and legend below.
  const top = pad + fsTitle + 10;
  const left = pad + textWidth('−3 SD', fsText) + 4;
  const right = W - pad - 2;
  const plotH = Math.round(Math.min(420, Math.max(130, W * 0.5)));
  const bottomAxis = top + plotH;
  const legendTop = bottomAxis + fsText + 6 + fsText + 8;
  const H = Math.round(legendTop + legendRows * legendRow + pad);
  const plot: Box = { x: left, y: top, w: right - left, h: plotH };

  let lo = Infinity;
  let hi = -Infinity;
  for (const s of series) for (const p of s.points) {
    lo = Math.min(lo, p.index);
    hi = Math.max(hi, p.index);
  }
  if (!Number.isFinite(lo)) {
    lo = 0;
    hi = 1;
  }
  if (hi - lo < 1) {
    lo -= 0.5;
    hi += 0.5;
  }
  const inset = Math.max(marker + 2, 6);
  const xOf = (i: number): number => plot.x + inset + ((i - lo) / (hi - lo)) * (plot.w - 2 * inset);
  const yOf = (z: number): number => plot.y + ((Z_EDGE - Math.max(-Z_EDGE, Math.min(Z_EDGE, z))) / (2 * Z_EDGE)) * plot.h;

  const title = input.title;
  const out: string[] = [];
  const total = series.reduce((a, s) => a + s.points.length, 0);
  const flagged: string[] = [];
  for (const s of series) {
    for (const p of s.points) {
      if (p.flags !== '') flagged.push(`${s.name === '' ? 'result' : s.name} at ${p.index} (z ${showZ(p.z)}): ${p.flags}`);
    }
  }
  const desc =
    total === 0
      ? 'No control results to show.'
      : `Control results in SD units from their target, in run order: ${total} result${total === 1 ? '' : 's'} of ` +
        `${series.length} material${series.length === 1 ? '' : 's'} (${series.map((s) => `${s.name === '' ? 'control results' : s.name}: ${s.points.length}`).join('; ')}). ` +
        `Lines at the target and at ±1, ±2 and ±3 SD. ` +
        (flagged.length === 0
          ? 'No result completes a control rule.'
          : `${flagged.length} flagged: ${flagged.slice(0, 12).join('; ')}${flagged.length > 12 ? `; and ${flagged.length - 12} more` : ''}.`);

  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" ` +
      `aria-label="${escapeXml(title)}" aria-describedby="${id}-desc" font-family="sans-serif">`,
  );
  out.push(`<title id="${id}-title">${escapeXml(title)}</title>`);
  out.push(`<desc id="${id}-desc">${escapeXml(desc)}</desc>`);
  out.push(`<rect class="background" x="${f(0)}" y="${f(0)}" width="${f(W)}" height="${f(H)}" fill="#ffffff"/>`);
  out.push(
    `<text class="title" x="${f(pad)}" y="${f(pad + fsTitle)}" font-size="${fsTitle}" font-weight="bold" fill="#202020">` +
      `${escapeXml(cut(title, fits(W - 2 * pad, fsTitle)))}</text>`,
  );

  // SD lines and their labels.
  out.push(`<g class="sd-lines">`);
  for (const k of [3, 2, 1, 0, -1, -2, -3]) {
    const y = yOf(k);
    const a = Math.abs(k);
    const style =
      a === 0
        ? `stroke="${GRID.zero}" stroke-width="1.2"`
        : a === 1
          ? `stroke="${GRID.one}" stroke-width="1" stroke-dasharray="1 3"`
          : a === 2
            ? `stroke="${GRID.two}" stroke-width="1" stroke-dasharray="5 3"`
            : `stroke="${GRID.three}" stroke-width="1.2" stroke-dasharray="9 3"`;
    out.push(`<line class="sd-line" data-sd="${k}" x1="${f(plot.x)}" y1="${f(y)}" x2="${f(plot.x + plot.w)}" y2="${f(y)}" ${style}/>`);
    out.push(
      `<text class="sd-label" x="${f(plot.x - 4)}" y="${f(y + fsText * 0.35)}" font-size="${fsText}" text-anchor="end" fill="#404040">${escapeXml(sdLabel(k))}</text>`,
    );
  }
  out.push(`</g>`);
  out.push(`<rect class="frame" x="${f(plot.x)}" y="${f(plot.y)}" width="${f(plot.w)}" height="${f(plot.h)}" fill="none" stroke="#b0b0b0" stroke-width="1"/>`);

  // Run-order axis.
  out.push(`<g class="x-axis">`);
  const maxTicks = Math.max(2, Math.floor(plot.w / (fsText * 4)));
  const integral = series.every((s) => s.points.every((p) => Number.isInteger(p.index)));
  for (const t of total === 0 ? [] : ticks(lo, hi, maxTicks)) {
    const x = xOf(t);
    out.push(`<line x1="${f(x)}" y1="${f(bottomAxis)}" x2="${f(x)}" y2="${f(bottomAxis + 3)}" stroke="#808080" stroke-width="1"/>`);
    out.push(
      `<text class="tick" x="${f(x)}" y="${f(bottomAxis + 4 + fsText)}" font-size="${fsText}" text-anchor="middle" fill="#404040">${t.toFixed(integral ? 0 : 1)}</text>`,
    );
  }
  out.push(
    `<text class="axis-name" x="${f(plot.x + plot.w / 2)}" y="${f(bottomAxis + 6 + 2 * fsText + 2)}" font-size="${fsText}" text-anchor="middle" fill="#404040">Run order</text>`,
  );
  out.push(`</g>`);

  if (total === 0) {
    out.push(
      `<text class="empty" x="${f(plot.x + plot.w / 2)}" y="${f(plot.y + plot.h / 2)}" font-size="${fsText}" text-anchor="middle" fill="#404040">No control results</text>`,
    );
  }

  // One line and one marker shape per material.
  const flagMarks: Array<{ x: number; y: number; text: string; full: string; z: number }> = [];
  const arrows: Box[] = [];
  const tipOf = (y: number, e: number): number => y + e * 0.5;
  series.forEach((s, si) => {
    const ink = INK[si % INK.length];
    const shape = SHAPES[si % SHAPES.length];
    const open = Math.floor(si / SHAPES.length) % 2 === 1;
    const pts = [...s.points].sort((a, b) => a.index - b.index);
    const d = pts.map((p, k) => `${k === 0 ? 'M' : 'L'}${f(xOf(p.index))} ${f(yOf(p.z))}`).join('');
    const name = escapeXml(s.name);
    out.push(`<g class="material" data-material="${name}">`);
    out.push(`<path class="series" data-material="${name}" d="${d}" fill="none" stroke="${ink}" stroke-width="1.2" stroke-linejoin="round"/>`);
    for (const p of pts) {
      const x = xOf(p.index);
      const y = yOf(p.z);
      const clamped = p.z > Z_EDGE ? 'up' : p.z < -Z_EDGE ? 'down' : '';
      const tip =
        `${s.name === '' ? 'Result' : s.name} at ${p.index}${p.label ? ` (${p.label})` : ''}: z ${showZ(p.z)}` +
        (clamped ? ' (off the chart)' : '') +
        (p.flags ? `; ${p.flags}` : '');
      out.push(
        `<path class="point${p.flags ? ' flagged' : ''}" data-material="${name}" data-index="${p.index}" data-z="${String(p.z)}" ` +
          `data-flags="${escapeXml(p.flags)}"${clamped ? ` data-clamped="${clamped}"` : ''} d="${shape(x, y, marker)}" ` +
          `fill="${open ? '#ffffff' : ink}" stroke="${ink}" stroke-width="1"><title>${escapeXml(tip)}</title></path>`,
      );
      if (clamped) {
        // An arrow beside the marker, pointing at the edge the result lies beyond.
        const e = clamped === 'up' ? -1 : 1;
        const ax = x + marker + 6;
        arrows.push({ x: ax - 4, y: Math.min(tipOf(y, e), tipOf(y, e) - e * 9) - 1, w: 8, h: 11 });
        const tip = tipOf(y, e);
        out.push(
          `<path class="clamp" data-clamped="${clamped}" d="M${f(ax)} ${f(tip - e * 9)}V${f(tip)}M${f(ax - 3)} ${f(tip - e * 4)}L${f(ax)} ${f(tip)}L${f(ax + 3)} ${f(tip - e * 4)}" ` +
            `fill="none" stroke="${ink}" stroke-width="1.3"/>`,
        );
      }
      if (p.flags) {
        out.push(
          `<circle class="flag-ring" data-flags="${escapeXml(p.flags)}" cx="${f(x)}" cy="${f(y)}" r="${f(marker + 3)}" fill="none" stroke="${FLAG_INK}" stroke-width="1.5"/>`,
        );
        flagMarks.push({ x, y, text: cut(p.flags, wide ? 24 : 16), full: p.flags, z: p.z });
      }
    }
    out.push(`</g>`);
  });

  // Labels of the flagged results: the first free place among a few around the point, else the
  // least crowded one; a label never leaves the drawing.
  const area: Box = { x: plot.x + 1, y: plot.y - 4, w: plot.w - 2, h: plot.h + 8 };
  const boxes: Box[] = [];
  const rings: Box[] = flagMarks.map((m) => ({ x: m.x - marker - 3, y: m.y - marker - 3, w: 2 * marker + 6, h: 2 * marker + 6 }));
  out.push(`<g class="flag-labels">`);
  for (const m of flagMarks) {
    const w = textWidth(m.text, fsFlag) + 4;
    const h = fsFlag + 3;
    const g = marker + 4;
    const upFirst = m.z >= 0;
    const vertical = upFirst ? [-g - h, g, -g - 2 * h, g + h] : [g, -g - h, g + h, -g - 2 * h];
    const candidates: Box[] = [];
    for (const dy of vertical) for (const dx of [-w / 2, 2, -w - 2]) candidates.push({ x: m.x + dx, y: m.y + dy, w, h });
    for (const c of candidates) {
      c.x = Math.max(area.x, Math.min(area.x + area.w - c.w, c.x));
      c.y = Math.max(area.y, Math.min(area.y + area.h - c.h, c.y));
    }
    const crowd = (c: Box): number =>
      boxes.reduce((a, b) => a + overlap(c, b), 0) + arrows.reduce((a, b) => a + overlap(c, b), 0) + rings.reduce((a, b) => a + overlap(c, b), 0) * 0.25;
    let best = candidates[0];
    let bestCrowd = Infinity;
    for (const c of candidates) {
      const k = crowd(c) + (inside(c, area) ? 0 : 1e6);
      if (k < bestCrowd) {
        bestCrowd = k;
        best = c;
      }
      if (k === 0) break;
    }
    boxes.push(best);
    out.push(
      `<g class="flag-label" data-flags="${escapeXml(m.full)}">` +
        `<rect x="${f(best.x)}" y="${f(best.y)}" width="${f(best.w)}" height="${f(best.h)}" fill="#ffffff" fill-opacity="0.85" stroke="none"/>` +
        `<text x="${f(best.x + 2)}" y="${f(best.y + fsFlag)}" font-size="${fsFlag}" fill="${FLAG_INK}">${escapeXml(m.text)}</text></g>`,
    );
  }
  out.push(`</g>`);

  // Legend.
  out.push(`<g class="legend">`);
  entries.forEach((e, k) => {
    const { x, row: r } = placed[k];
    const cy = legendTop + r * legendRow + legendRow / 2;
    const tx = x + sample + 4;
    if (e.kind === 'material') {
      const ink = INK[e.s % INK.length];
      const open = Math.floor(e.s / SHAPES.length) % 2 === 1;
      out.push(
        `<g class="legend-entry" data-material="${escapeXml(series[e.s].name)}">` +
          `<line x1="${f(x)}" y1="${f(cy)}" x2="${f(x + sample)}" y2="${f(cy)}" stroke="${ink}" stroke-width="1.2"/>` +
          `<path d="${SHAPES[e.s % SHAPES.length](x + sample / 2, cy, marker)}" fill="${open ? '#ffffff' : ink}" stroke="${ink}" stroke-width="1"/>` +
          `<text x="${f(tx)}" y="${f(cy + fsText * 0.35)}" font-size="${fsText}" fill="#202020">${escapeXml(e.text)}</text></g>`,
      );
    } else if (e.kind === 'flag') {
      out.push(
        `<g class="legend-entry" data-key="flag"><circle cx="${f(x + sample / 2)}" cy="${f(cy)}" r="${f(marker + 3)}" fill="none" stroke="${FLAG_INK}" stroke-width="1.5"/>` +
          `<text x="${f(tx)}" y="${f(cy + fsText * 0.35)}" font-size="${fsText}" fill="#202020">${escapeXml(e.text)}</text></g>`,
      );
    } else {
      const cx = x + sample / 2;
      out.push(
        `<g class="legend-entry" data-key="clamp"><path d="M${f(cx)} ${f(cy + 5)}V${f(cy - 5)}M${f(cx - 3)} ${f(cy - 1)}L${f(cx)} ${f(cy - 5)}L${f(cx + 3)} ${f(cy - 1)}" fill="none" stroke="#404040" stroke-width="1.3"/>` +
          `<text x="${f(tx)}" y="${f(cy + fsText * 0.35)}" font-size="${fsText}" fill="#202020">${escapeXml(e.text)}</text></g>`,
      );
    }
  });
  out.push(`</g>`);
  out.push(`</svg>`);
  return out.join('\n');
}

/**
 * The chart's series from an evaluation of control results (evaluateControls): one series per
 * material, each result at its position in run order (1, 2, …), labelled with its run.
 */
export function chartSeries(ev: ControlEvaluation): ChartSeries[] {
  const out: Array<{ name: string; points: ChartPoint[] }> = ev.levelLabels.map((name) => ({ name, points: [] }));
  for (let i = 0; i < ev.z.length; i++) {
    const z = ev.z[i];
    if (z === null) continue;
    const run = ev.runLabels[ev.run[i]];
    out[ev.level[i]].points.push({ index: ev.position[i] + 1, z, flags: ev.flags[i], ...(run ? { label: `run ${run}` } : {}) });
  }
  for (const s of out) s.points.sort((a, b) => a.index - b.index);
  return out;
}
