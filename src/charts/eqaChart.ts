/**
 * The EQA chart of one analyte across rounds, as an SVG document in a string.
 *
 * The laboratory's deviation from the assigned value, in percent, one mark per round in round
 * order, every round named under the axis. The EQA limit is drawn as two lines (+limit and
 * −limit) over a pale band of the room inside it; a limit that varies by round (an absolute limit
 * judged at each assigned value) steps from round to round. The running mean of the deviation is
 * a dark dashed line. A round outside the limit is a diamond in a warm red, a round within it a
 * round dot; a round without a deviation (an error) gets a small cross on the axis.
 * <title>, <desc> and the role/aria attributes describe the chart to screen readers.
 *
 * A pure function of its input: no DOM, no Node, no fonts measured. Text is sized by a generous
 * width per character (0.62 em) as in the control chart, so the layout does not depend on which
 * sans-serif font is installed. Marks carry data-* attributes (deviation at full precision,
 * limit, round) so the drawing can be checked against the data.
 */
import { CHAR_EM, cut, escapeXml, f, flowKey, textWidth } from './text';
import type { EqaAnalyteRounds } from '../engine/eqaRounds';

/** One round on the chart. */
export interface EqaChartRound {
  /** The round's label, shown under the axis. */
  readonly label: string;
  /** Deviation %, or null when it could not be computed. */
  readonly deviation: number | null;
  /** Running mean deviation % up to this round, or null. */
  readonly runningMean: number | null;
  /** The EQA limit % at this round, or null when there is none. */
  readonly limit: number | null;
}

export interface EqaChartInput {
  readonly title: string;
  readonly rounds: readonly EqaChartRound[];
  /** Width in px: 320 fits the task pane; 520–900 for print. Default 320, accepted 240–4000. */
  readonly width?: number;
  /** Prefix of the ids of <title> and <desc>, unique per page. */
  readonly id?: string;
}

const INK = {
  point: '#1f4e79',
  outside: '#b23a1e',
  mean: '#303030',
  limit: '#7d5a12',
  band: '#f4eedc',
  zero: '#8c8c8c',
  grid: '#e2e2e2',
  text: '#303030',
};

/** A tick step of 1, 2 or 5 × 10^k giving at most `most` steps over `span`. */
function tickStep(span: number, most: number): number {
  const raw = span / Math.max(1, most);
  const p = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 5, 10]) if (m * p >= raw) return m * p;
  return 10 * p;
}

function percentText(x: number, step: number): string {
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  const s = x.toFixed(decimals);
  const t = s.replace(/^-0(\.0*)?$/, '0$1');
  return (x > 0 ? '+' : '') + t.replace('-', '−') + ' %';
}

function signed(x: number): string {
  const s = x.toFixed(2);
  return (x > 0 ? '+' : '') + (s === '-0.00' ? '0.00' : s).replace('-', '−');
}

/** The title in at most two lines of `max` characters, split at spaces; the second cut when it is longer. */
function wrapTitle(title: string, max: number): string[] {
  if (Array.from(title).length <= max) return [title];
  const words = title.split(' ');
  let first = '';
  let k = 0;
  while (k < words.length && Array.from(first ? `${first} ${words[k]}` : words[k]).length <= max) first = first ? `${first} ${words[k++]}` : words[k++];
  if (k === 0) return [cut(title, max)];
  return [first, cut(words.slice(k).join(' '), max)];
}

/** The chart's rounds from the engine's figures of one analyte. */
export function eqaChartRounds(a: EqaAnalyteRounds): EqaChartRound[] {
  return a.rounds.map((r) => ({
    label: r.input.round,
    deviation: r.deviation.ok ? r.deviation.value : null,
    runningMean: r.runningMean.ok ? r.runningMean.value : null,
    limit: r.limit.ok ? r.limit.value : null,
  }));
}

/**
 * The chart as an SVG document (a string starting with "<svg"). Throws a RangeError for a width
 * outside 240–4000 px, or a deviation, mean or limit that is not finite (a limit must be ≥ 0).
 */
export function eqaChartSvg(input: EqaChartInput): string {
  const W = input.width ?? 320;
  if (!(W >= 240 && W <= 4000)) throw new RangeError(`chart width must be 240 to 4000 px (got ${W})`);
  const id = (input.id ?? 'leeway-eqa-chart').replace(/[^A-Za-z0-9_-]/g, '-');
  const rounds = input.rounds;
  rounds.forEach((r, i) => {
    for (const [name, x] of [['deviation', r.deviation], ['running mean', r.runningMean], ['limit', r.limit]] as const) {
      if (x !== null && !Number.isFinite(x)) throw new RangeError(`round ${i + 1} (${r.label}) has ${name} ${x}: it must be a finite number or null`);
    }
    if (r.limit !== null && r.limit < 0) throw new RangeError(`round ${i + 1} (${r.label}) has limit ${r.limit}: it must be ≥ 0`);
  });
  const wide = W >= 480;
  const fsTitle = wide ? 15 : 12;
  const fs = wide ? 11 : 9.5;
  const pad = 8;
  const dot = wide ? 4.2 : 3.4;

  // Vertical scale: symmetric about 0, room for every deviation, mean and limit, and a margin.
  let span = 0;
  for (const r of rounds) for (const x of [r.deviation, r.runningMean, r.limit]) if (x !== null) span = Math.max(span, Math.abs(x));
  span = span === 0 ? 1 : span * 1.12;
  const plotH = Math.round(Math.min(320, Math.max(140, W * 0.42)));
  const step = tickStep(2 * span, Math.max(3, Math.floor(plotH / (fs * 2.6))));
  const top = Math.ceil(span / step) * step;

  // Round labels: level when they fit their slot, else turned by 50°.
  const n = rounds.length;
  const yLabelW = Math.max(...[top, -top].map((t) => textWidth(percentText(t, step), fs)));
  const left = pad + yLabelW + 6;
  const right = W - pad - 4;
  const slot = n > 0 ? (right - left) / n : right - left;
  const labelChars = wide ? 16 : 12;
  const labels = rounds.map((r) => cut(r.label, labelChars));
  const longest = Math.max(0, ...labels.map((t) => textWidth(t, fs)));
  const turned = longest > slot - 4;
  const angle = 50;
  const labelH = turned ? longest * Math.sin((angle * Math.PI) / 180) + fs : fs + 2;

  // Legend: the keys of what is drawn, wrapped to the width.
  const anyLimit = rounds.some((r) => r.limit !== null);
  const anyOutside = rounds.some((r) => r.deviation !== null && r.limit !== null && Math.abs(r.deviation) > r.limit);
  const anyMissing = rounds.some((r) => r.deviation === null);
  const keys: Array<{ kind: string; text: string }> = [{ kind: 'point', text: anyLimit ? 'Deviation, within limit' : 'Deviation' }];
  if (anyOutside) keys.push({ kind: 'outside', text: 'Outside the limit' });
  keys.push({ kind: 'mean', text: 'Running mean' });
  if (anyLimit) keys.push({ kind: 'limit', text: '± EQA limit' });
  if (anyMissing) keys.push({ kind: 'missing', text: 'No deviation (error)' });
  const sample = 18;
  const legendRow = fs + 8;
  const { placed, rows: legendRows } = flowKey(keys.map((k) => sample + 5 + textWidth(k.text, fs) + 12), pad, W - pad);

  const titleLines = wrapTitle(input.title, Math.floor((W - 2 * pad) / (CHAR_EM * fsTitle)));
  const titleH = titleLines.length * (fsTitle + 3);
  const plotTop = pad + titleH + 5 + fs + 6;
  const plotBottom = plotTop + plotH;
  const axisName = plotBottom + 4 + labelH + fs + 4;
  const legendTop = axisName + 8;
  const H = Math.round(legendTop + legendRows * legendRow + pad);
  const xOf = (i: number): number => left + slot * (i + 0.5);
  const yOf = (p: number): number => plotTop + ((top - p) / (2 * top)) * plotH;

  const outside = rounds.filter((r) => r.deviation !== null && r.limit !== null && Math.abs(r.deviation) > r.limit).length;
  const shown = rounds.filter((r) => r.deviation !== null).length;
  const lastMean = [...rounds].reverse().find((r) => r.runningMean !== null)?.runningMean ?? null;
  const desc =
    n === 0
      ? 'No EQA rounds to show.'
      : `Deviation from the assigned value in percent over ${n} round${n === 1 ? '' : 's'} (${rounds.map((r) => r.label).join(', ')}); ` +
        `${shown} drawn` +
        (anyLimit ? `, ${outside} outside the EQA limit` : ', no EQA limit given') +
        (lastMean !== null ? `; running mean after the last round ${signed(lastMean)} %.` : '.');

  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" ` +
      `aria-label="${escapeXml(input.title)}" aria-describedby="${id}-desc" font-family="sans-serif">`,
  );
  out.push(`<title id="${id}-title">${escapeXml(input.title)}</title>`);
  out.push(`<desc id="${id}-desc">${escapeXml(desc)}</desc>`);
  out.push(`<rect class="background" x="0.00" y="0.00" width="${f(W)}" height="${f(H)}" fill="#ffffff"/>`);
  titleLines.forEach((t, i) => out.push(`<text class="title" x="${f(pad)}" y="${f(pad + fsTitle + i * (fsTitle + 3))}" font-size="${fsTitle}" font-weight="bold" fill="#202020">${escapeXml(t)}</text>`));
  out.push(`<text class="y-name" x="${f(pad)}" y="${f(pad + titleH + 5 + fs)}" font-size="${fs}" fill="${INK.text}">Deviation from the assigned value, %</text>`);

  // Limit band (the room inside ±limit), grid, zero line.
  const segments = (sign: 1 | -1): string =>
    rounds
      .map((r, i) => (r.limit === null ? null : { i, y: yOf(sign * r.limit) }))
      .filter((s): s is { i: number; y: number } => s !== null)
      .map((s, k, all) => {
        const x0 = left + slot * s.i;
        const x1 = x0 + slot;
        const joined = k > 0 && all[k - 1].i === s.i - 1;
        return `${joined ? 'L' : 'M'}${f(x0)} ${f(s.y)}H${f(x1)}`;
      })
      .join('');
  out.push(`<g class="limit-band">`);
  rounds.forEach((r, i) => {
    if (r.limit === null) return;
    out.push(`<rect x="${f(left + slot * i)}" y="${f(yOf(r.limit))}" width="${f(slot)}" height="${f(yOf(-r.limit) - yOf(r.limit))}" fill="${INK.band}" stroke="none"/>`);
  });
  out.push(`</g>`);
  out.push(`<g class="y-axis">`);
  for (let t = -top; t <= top + step / 1e6; t += step) {
    const v = Math.abs(t) < step / 1e6 ? 0 : t;
    const y = yOf(v);
    out.push(`<line class="grid" data-percent="${v}" x1="${f(left)}" y1="${f(y)}" x2="${f(right)}" y2="${f(y)}" stroke="${v === 0 ? INK.zero : INK.grid}" stroke-width="${v === 0 ? 1.2 : 1}"/>`);
    out.push(`<text class="tick" x="${f(left - 4)}" y="${f(y + fs * 0.35)}" font-size="${fs}" text-anchor="end" fill="${INK.text}">${escapeXml(percentText(v, step))}</text>`);
  }
  out.push(`</g>`);
  out.push(`<rect class="frame" x="${f(left)}" y="${f(plotTop)}" width="${f(right - left)}" height="${f(plotH)}" fill="none" stroke="#b0b0b0" stroke-width="1"/>`);
  if (anyLimit) {
    for (const sign of [1, -1] as const) {
      out.push(`<path class="limit-line" data-sign="${sign > 0 ? '+' : '-'}" d="${segments(sign)}" fill="none" stroke="${INK.limit}" stroke-width="1.6"/>`);
    }
    rounds.forEach((r, i) => {
      if (r.limit === null) return;
      out.push(`<line class="limit" data-round="${escapeXml(r.label)}" data-limit="${String(r.limit)}" x1="${f(left + slot * i)}" y1="${f(yOf(r.limit))}" x2="${f(left + slot * (i + 1))}" y2="${f(yOf(r.limit))}" stroke="none"/>`);
    });
  }

  // Round labels under the axis.
  out.push(`<g class="x-axis">`);
  labels.forEach((t, i) => {
    const x = xOf(i);
    out.push(`<line x1="${f(x)}" y1="${f(plotBottom)}" x2="${f(x)}" y2="${f(plotBottom + 3)}" stroke="#808080" stroke-width="1"/>`);
    const y = plotBottom + 4 + fs;
    out.push(
      turned
        ? `<text class="round-label" x="${f(x + fs * 0.3)}" y="${f(plotBottom + 6)}" font-size="${fs}" text-anchor="end" transform="rotate(-${angle} ${f(x + fs * 0.3)} ${f(plotBottom + 6)})" dominant-baseline="hanging" fill="${INK.text}">${escapeXml(t)}</text>`
        : `<text class="round-label" x="${f(x)}" y="${f(y)}" font-size="${fs}" text-anchor="middle" fill="${INK.text}">${escapeXml(t)}</text>`,
    );
  });
  out.push(`<text class="axis-name" x="${f((left + right) / 2)}" y="${f(axisName)}" font-size="${fs}" text-anchor="middle" fill="${INK.text}">EQA round</text>`);
  out.push(`</g>`);

  // Running mean.
  const meanPts = rounds.map((r, i) => (r.runningMean === null ? null : `${f(xOf(i))} ${f(yOf(r.runningMean))}`));
  let d = '';
  let pen = false;
  for (const p of meanPts) {
    if (p === null) {
      pen = false;
      continue;
    }
    d += `${pen ? 'L' : 'M'}${p}`;
    pen = true;
  }
  if (d) out.push(`<path class="running-mean" d="${d}" fill="none" stroke="${INK.mean}" stroke-width="1.5" stroke-dasharray="6 3" stroke-linejoin="round"/>`);

  // The rounds' marks.
  out.push(`<g class="rounds">`);
  rounds.forEach((r, i) => {
    const x = xOf(i);
    if (r.deviation === null) {
      const y = yOf(0);
      const s = dot * 0.9;
      out.push(`<path class="missing" data-round="${escapeXml(r.label)}" d="M${f(x - s)} ${f(y - s)}L${f(x + s)} ${f(y + s)}M${f(x - s)} ${f(y + s)}L${f(x + s)} ${f(y - s)}" stroke="${INK.outside}" stroke-width="1.5"/>`);
      return;
    }
    const y = yOf(r.deviation);
    const out_ = r.limit !== null && Math.abs(r.deviation) > r.limit;
    const tip = `${r.label}: deviation ${signed(r.deviation)} %` + (r.limit !== null ? ` (limit ±${r.limit.toFixed(2)} %${out_ ? ', outside' : ''})` : '');
    const attrs = `class="point${out_ ? ' outside' : ''}" data-round="${escapeXml(r.label)}" data-deviation="${String(r.deviation)}"${r.limit !== null ? ` data-limit="${String(r.limit)}"` : ''}`;
    if (out_) {
      const s = dot * 1.3;
      out.push(`<path ${attrs} d="M${f(x)} ${f(y - s)}L${f(x + s)} ${f(y)}L${f(x)} ${f(y + s)}L${f(x - s)} ${f(y)}Z" fill="${INK.outside}" stroke="#ffffff" stroke-width="0.8"><title>${escapeXml(tip)}</title></path>`);
    } else {
      out.push(`<circle ${attrs} cx="${f(x)}" cy="${f(y)}" r="${f(dot)}" fill="${INK.point}" stroke="#ffffff" stroke-width="0.8"><title>${escapeXml(tip)}</title></circle>`);
    }
  });
  out.push(`</g>`);
  if (n === 0) out.push(`<text class="empty" x="${f((left + right) / 2)}" y="${f(yOf(0) - 6)}" font-size="${fs}" text-anchor="middle" fill="${INK.text}">No EQA rounds</text>`);

  // Legend.
  out.push(`<g class="legend">`);
  keys.forEach((k, i) => {
    const { x, row: r } = placed[i];
    const cy = legendTop + r * legendRow + legendRow / 2;
    const cx = x + sample / 2;
    let mark: string;
    if (k.kind === 'point') mark = `<circle cx="${f(cx)}" cy="${f(cy)}" r="${f(dot)}" fill="${INK.point}"/>`;
    else if (k.kind === 'outside') mark = `<path d="M${f(cx)} ${f(cy - dot * 1.3)}L${f(cx + dot * 1.3)} ${f(cy)}L${f(cx)} ${f(cy + dot * 1.3)}L${f(cx - dot * 1.3)} ${f(cy)}Z" fill="${INK.outside}"/>`;
    else if (k.kind === 'mean') mark = `<line x1="${f(x)}" y1="${f(cy)}" x2="${f(x + sample)}" y2="${f(cy)}" stroke="${INK.mean}" stroke-width="1.5" stroke-dasharray="6 3"/>`;
    else if (k.kind === 'limit') mark = `<rect x="${f(x)}" y="${f(cy - 5)}" width="${f(sample)}" height="10" fill="${INK.band}"/><line x1="${f(x)}" y1="${f(cy - 5)}" x2="${f(x + sample)}" y2="${f(cy - 5)}" stroke="${INK.limit}" stroke-width="1.6"/><line x1="${f(x)}" y1="${f(cy + 5)}" x2="${f(x + sample)}" y2="${f(cy + 5)}" stroke="${INK.limit}" stroke-width="1.6"/>`;
    else mark = `<path d="M${f(cx - 3)} ${f(cy - 3)}L${f(cx + 3)} ${f(cy + 3)}M${f(cx - 3)} ${f(cy + 3)}L${f(cx + 3)} ${f(cy - 3)}" stroke="${INK.outside}" stroke-width="1.5"/>`;
    out.push(`<g class="legend-entry" data-key="${k.kind}">${mark}<text x="${f(x + sample + 5)}" y="${f(cy + fs * 0.35)}" font-size="${fs}" fill="#202020">${escapeXml(k.text)}</text></g>`);
  });
  out.push(`</g>`);
  out.push(`</svg>`);
  return out.join('\n');
}
