/**
 * Everything said about the worksheet functions outside their code, made from the catalogue and
 * only from it: Excel's metadata (functions.json), the help page of each function (the function
 * wizard's "help on this function"), the README table, the reference pages in docs/reference,
 * and the text of `leeway list` and `leeway help`. Pure: strings and plain objects, no files.
 */
import { CAUTION } from '../engine/caution';
import { VERSION } from '../engine/version';
import type { AnyParam, Example, FunctionDef } from './define';
import { evaluate, FUNCTIONS, NAMESPACE } from './index';
import type { Arg, OutCell, Output } from './types';

/** The wizard's description: the catalogue's description, then its sources. */
export function wizardDescription(def: FunctionDef): string {
  const sources = def.doc.sources;
  const label = sources.length === 1 ? 'Source' : 'Sources';
  return `${def.doc.description} ${label}: ${sources.join('; ')}.`;
}

/** A parameter's text as the wizard shows it. */
function paramText(p: AnyParam): string {
  return p.text;
}

/** The page of a function's help, relative to the add-in's origin. */
export function helpPath(def: FunctionDef): string {
  return `help/${def.name}.html`;
}

export interface FunctionsJson {
  readonly allowCustomDataForDataTypeAny: boolean;
  readonly functions: ReadonlyArray<{
    readonly id: string;
    readonly name: string;
    readonly description: string;
    readonly helpUrl: string;
    readonly parameters: ReadonlyArray<{ name: string; description: string; type: 'any'; dimensionality: 'matrix'; optional?: true }>;
    readonly result: { readonly dimensionality: 'matrix' };
  }>;
}

/**
 * Excel's custom-function metadata (the "manually created JSON metadata" form of the Office
 * documentation). Every parameter is a matrix of any type, so a range in any argument reaches
 * the registry, which validates every cell. Ids are the catalogue names and never change.
 */
export function functionsJson(origin: string): FunctionsJson {
  const base = origin.replace(/\/$/, '');
  return {
    allowCustomDataForDataTypeAny: true,
    functions: FUNCTIONS.map((def) => ({
      id: def.name,
      name: def.name,
      description: wizardDescription(def),
      helpUrl: `${base}/${helpPath(def)}`,
      parameters: def.params.map((p) => ({
        name: p.name,
        description: paramText(p),
        type: 'any' as const,
        dimensionality: 'matrix' as const,
        ...(p.optional ? { optional: true as const } : {}),
      })),
      result: { dimensionality: 'matrix' as const },
    })),
  };
}

// ---------------------------------------------------------------------------------------------
// Examples: as Excel shows them, and their results
// ---------------------------------------------------------------------------------------------

type ExampleArg = Example['args'][number];

function excelScalar(v: number | string): string {
  return typeof v === 'number' ? String(v) : `"${v}"`;
}

/** One example argument in Excel's syntax: a range as an array constant ({1;2;3} is a column). */
export function excelArg(a: ExampleArg): string {
  if (a === null) return '';
  if (Array.isArray(a)) return `{${a.map((row) => row.map(excelScalar).join(',')).join(';')}}`;
  return excelScalar(a as number | string);
}

/** The example call as a user types it. */
export function exampleFormula(def: FunctionDef): string {
  return `=${NAMESPACE}.${def.name}(${def.doc.example.args.map(excelArg).join(', ')})`;
}

/** The example's result through the registry. */
export function exampleResult(def: FunctionDef): Output {
  return evaluate(def.name, def.doc.example.args as readonly Arg[]);
}

/** A number as the README shows it: four significant digits, integers whole. */
export function shownNumber(x: number): string {
  if (Number.isInteger(x) && Math.abs(x) < 1e15) return String(x);
  return x.toPrecision(4);
}

function shownCell(v: OutCell): string {
  if (typeof v === 'number') return shownNumber(v);
  if (typeof v === 'string') return `"${v}"`;
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  return `${v.error} ${v.message}`;
}

/** The example's result in words: a value, or the labelled figures the example names. */
export function shownResult(def: FunctionDef): string {
  const out = exampleResult(def);
  if (out.length === 1 && out[0].length === 1) return shownCell(out[0][0]);
  if (def.labels) {
    const labels = def.labels;
    const show = def.doc.example.show ?? labels.slice(0, 3);
    return 'spill: ' + show.map((l) => `\`${l}\` ${shownCell(out[1][labels.indexOf(l)])}`).join(', ');
  }
  if (out[0].length === 1 && out.length <= 8) return 'column: ' + out.map((row) => shownCell(row[0])).join(', ');
  return `${out.length}×${out[0].length} spill`;
}

function mdEscape(s: string): string {
  return s.replace(/\|/g, '\\|');
}

/** The README's function table (between its functions:start and functions:end markers). */
export function readmeTable(): string {
  const lines = ['| example | result | what it gives |', '|---|---|---|'];
  for (const def of FUNCTIONS) {
    lines.push(`| \`${exampleFormula(def)}\` | ${mdEscape(shownResult(def))} | ${mdEscape(def.doc.summary)} |`);
  }
  return lines.join('\n');
}

// ---------------------------------------------------------------------------------------------
// Syntax, list and help text
// ---------------------------------------------------------------------------------------------

/** `LEEWAY.SPEC.TOTAL(cvi, cvg, [tier], [z])`. */
export function syntax(def: FunctionDef): string {
  return `${NAMESPACE}.${def.name}(${def.params.map((p) => (p.optional ? `[${p.name}]` : p.name)).join(', ')})`;
}

function defaultText(p: AnyParam): string {
  if (!p.optional) return 'required';
  if (p.default === undefined) return 'optional';
  return `optional, default ${typeof p.default === 'string' ? `"${p.default}"` : p.default}`;
}

/** `leeway list`: one line per function. */
export function listLines(): string[] {
  return FUNCTIONS.map((def) => `${syntax(def)}  — ${def.doc.summary}`);
}

/** `leeway help FUNCTION`: the help page as plain text. */
export function helpLines(def: FunctionDef): string[] {
  const out = [syntax(def), '', def.doc.description, '', 'Arguments:'];
  for (const p of def.params) out.push(`  ${p.name} (${p.kind}, ${defaultText(p)}): ${paramText(p)}`);
  out.push('', `Result: ${def.doc.returns}`);
  if (def.labels) out.push(`Spills two rows: the labels ${def.labels.map((l) => `"${l}"`).join(', ')}, then the values.`);
  for (const note of def.doc.notes ?? []) out.push('', note);
  out.push('', `Example: ${exampleFormula(def)}  →  ${shownResult(def)}`);
  out.push('', `${def.doc.sources.length === 1 ? 'Source' : 'Sources'}: ${def.doc.sources.join('; ')}.`);
  return out;
}

// ---------------------------------------------------------------------------------------------
// Help pages (served with the add-in) and reference pages (docs/reference/functions)
// ---------------------------------------------------------------------------------------------

function html(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

const CSP = "default-src 'self'; script-src 'none'; style-src 'self'; img-src 'self'; object-src 'none'; base-uri 'none'; form-action 'none'";

function page(title: string, body: string): string {
  return [
    '<!doctype html>',
    '<html lang="en">',
    '<head>',
    '<meta charset="utf-8" />',
    `<meta http-equiv="Content-Security-Policy" content="${CSP}" />`,
    '<meta name="viewport" content="width=device-width, initial-scale=1" />',
    `<title>${html(title)}</title>`,
    '<link rel="stylesheet" href="help.css" />',
    '</head>',
    '<body>',
    body,
    `<footer><p class="caution"><strong>Caution.</strong> ${html(CAUTION)}</p><p>Leeway ${html(VERSION)}</p></footer>`,
    '</body>',
    '</html>',
    '',
  ].join('\n');
}

/** The help page of one function: what the function wizard links to. */
export function helpPage(def: FunctionDef): string {
  const rows = def.params
    .map((p) => `<tr><th scope="row"><code>${html(p.name)}</code></th><td>${html(defaultText(p))}</td><td>${html(paramText(p))}</td></tr>`)
    .join('\n');
  const labels = def.labels
    ? `<p>Spills two rows: the labels, then one value under each:</p><ol class="labels">${def.labels.map((l) => `<li>${html(l)}</li>`).join('')}</ol>`
    : '';
  const notes = (def.doc.notes ?? []).map((n) => `<p>${html(n)}</p>`).join('\n');
  const body = [
    '<nav><a href="index.html">All Leeway functions</a></nav>',
    '<main>',
    `<h1><code>${html(NAMESPACE + '.' + def.name)}</code></h1>`,
    `<p class="summary">${html(def.doc.summary)}</p>`,
    `<pre class="syntax">${html(syntax(def))}</pre>`,
    `<p>${html(def.doc.description)}</p>`,
    notes,
    '<h2>Arguments</h2>',
    `<table><thead><tr><th scope="col">argument</th><th scope="col">use</th><th scope="col">meaning</th></tr></thead><tbody>\n${rows}\n</tbody></table>`,
    '<h2>Result</h2>',
    `<p>${html(def.doc.returns)}</p>`,
    labels,
    '<h2>Example</h2>',
    `<pre>${html(exampleFormula(def))}</pre>`,
    `<p>gives ${html(shownResult(def))}</p>`,
    `<h2>${def.doc.sources.length === 1 ? 'Source' : 'Sources'}</h2>`,
    `<ul>${def.doc.sources.map((s) => `<li>${html(s)}</li>`).join('')}</ul>`,
    '</main>',
  ].join('\n');
  return page(`${NAMESPACE}.${def.name} — Leeway help`, body);
}

/** The index of the help pages. */
export function helpIndex(): string {
  const items = FUNCTIONS.map((def) => `<li><a href="${html(def.name)}.html"><code>${html(NAMESPACE + '.' + def.name)}</code></a> — ${html(def.doc.summary)}</li>`).join('\n');
  return page('Leeway worksheet functions', `<main><h1>Leeway worksheet functions</h1><ul class="index">\n${items}\n</ul></main>`);
}

/** The style sheet of the help pages (served beside them; the pages allow no inline style). */
export const HELP_CSS = `body{font-family:system-ui,sans-serif;line-height:1.45;margin:0 auto;max-width:46rem;padding:1rem;color:#1d232a}
code,pre{font-family:ui-monospace,monospace}pre{background:#f3f5f7;padding:.5rem;overflow-x:auto;white-space:pre-wrap}
table{border-collapse:collapse;width:100%}th,td{border-top:1px solid #d5dbe1;padding:.35rem;text-align:left;vertical-align:top}
.summary{font-size:1.1rem}.caution{border-left:4px solid #8a5a00;padding-left:.6rem}footer{margin-top:2rem;font-size:.9rem}
`;

/** The reference page of one function in docs/reference/functions (Markdown). */
export function referencePage(def: FunctionDef): string {
  const lines = [`# ${NAMESPACE}.${def.name}`, '', def.doc.summary.charAt(0).toUpperCase() + def.doc.summary.slice(1) + '.', '', '```', syntax(def), '```', '', def.doc.description, ''];
  for (const note of def.doc.notes ?? []) lines.push(note, '');
  lines.push('| argument | use | meaning |', '|---|---|---|');
  for (const p of def.params) lines.push(`| \`${p.name}\` | ${defaultText(p)} | ${mdEscape(paramText(p))} |`);
  lines.push('', `**Result:** ${def.doc.returns}`, '');
  if (def.labels) lines.push(`Spills two rows: the labels ${def.labels.map((l) => `\`${l}\``).join(', ')}, then the values.`, '');
  lines.push(`**Example:** \`${exampleFormula(def)}\` gives ${shownResult(def)}.`, '');
  lines.push(`**${def.doc.sources.length === 1 ? 'Source' : 'Sources'}:** ${def.doc.sources.join('; ')}.`, '');
  lines.push('*Generated from the function catalogue (`npm run docs`); do not edit by hand.*', '');
  return lines.join('\n');
}

/** The index of the reference pages (docs/reference/functions/README.md). */
export function referenceIndex(): string {
  const lines = ['# Worksheet functions', '', 'One page per function, generated from the function catalogue (`npm run docs`).', ''];
  for (const def of FUNCTIONS) lines.push(`- [\`${NAMESPACE}.${def.name}\`](${def.name}.md) — ${def.doc.summary}`);
  lines.push('');
  return lines.join('\n');
}
