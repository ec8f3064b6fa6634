/**
 * The pane's only way to build DOM. Text always goes in as text nodes (textContent), never as
 * markup, so an analyte name such as `<img src=x onerror=…>` shows as those characters. No
 * innerHTML anywhere in the pane; no inline style attributes (the Content-Security-Policy forbids
 * them), only classes.
 */

export type Child = Node | string | number | null | undefined | false;

export interface Attrs {
  [name: string]: string | number | boolean | null | undefined | EventListener;
}

function append(parent: Node, children: readonly Child[]): void {
  for (const c of children) {
    if (c === null || c === undefined || c === false) continue;
    parent.appendChild(typeof c === 'object' ? c : document.createTextNode(String(c)));
  }
}

function setAttrs(node: Element, attrs: Attrs | undefined): void {
  if (!attrs) return;
  for (const key of Object.keys(attrs)) {
    const v = attrs[key];
    if (v === null || v === undefined || v === false) continue;
    if (typeof v === 'function') {
      node.addEventListener(key.replace(/^on/, ''), v);
    } else if (key === 'class') {
      node.setAttribute('class', String(v));
    } else if (v === true) {
      node.setAttribute(key, '');
    } else {
      node.setAttribute(key, String(v));
    }
  }
}

/** An HTML element: `h('button', { class: 'primary', onclick: go }, 'Fill')`. */
export function h<K extends keyof HTMLElementTagNameMap>(
  tag: K,
  attrs?: Attrs,
  ...children: Child[]
): HTMLElementTagNameMap[K] {
  const node = document.createElement(tag);
  setAttrs(node, attrs);
  append(node, children);
  return node;
}

const SVG_NS = 'http://www.w3.org/2000/svg';

/** An SVG element; attributes are presentation attributes (allowed by the CSP), not styles. */
export function s(tag: string, attrs?: Attrs, ...children: Child[]): SVGElement {
  const node = document.createElementNS(SVG_NS, tag) as SVGElement;
  setAttrs(node, attrs);
  append(node, children);
  return node;
}

/** Replaces all children of `node`. */
export function replace(node: Element, ...children: Child[]): void {
  while (node.firstChild) node.removeChild(node.firstChild);
  append(node, children);
}

let idCounter = 0;

/** A document-unique id for label/aria wiring. */
export function uid(prefix: string): string {
  idCounter += 1;
  return `${prefix}-${idCounter}`;
}

/** A labelled form control: the label's `for` points at the control. */
export function field(label: string, control: HTMLElement, hint?: string): HTMLElement {
  if (!control.id) control.id = uid('f');
  const kids: Child[] = [h('label', { for: control.id }, label), control];
  if (hint) {
    const hintId = uid('hint');
    control.setAttribute('aria-describedby', hintId);
    kids.push(h('p', { class: 'hint', id: hintId }, hint));
  }
  return h('div', { class: 'field' }, ...kids);
}

/** A fieldset of radio buttons; `onChange` gets the chosen value. */
export function radioGroup<V extends string>(
  legend: string,
  name: string,
  options: ReadonlyArray<{ value: V; label: string }>,
  chosen: V,
  onChange: (v: V) => void,
): HTMLFieldSetElement {
  const box = h('fieldset', { class: 'radios' }, h('legend', {}, legend));
  for (const o of options) {
    const input = h('input', { type: 'radio', name, value: o.value, id: uid(name) });
    input.checked = o.value === chosen;
    input.addEventListener('change', () => {
      if (input.checked) onChange(o.value);
    });
    box.appendChild(h('label', { class: 'radio', for: input.id }, input, o.label));
  }
  return box;
}

/**
 * An SVG drawing made as a string (src/charts) as a node of this page: parsed as XML (no HTML
 * parser, no scripts run), then imported. Throws when the string is not one SVG document.
 */
export function svgFromString(markup: string): SVGSVGElement {
  const doc = new DOMParser().parseFromString(markup, 'image/svg+xml');
  const root = doc.documentElement;
  if (root.localName !== 'svg' || root.namespaceURI !== SVG_NS || doc.getElementsByTagName('parsererror').length > 0) {
    throw new Error('The chart could not be drawn.');
  }
  return document.importNode(root, true) as unknown as SVGSVGElement;
}

/**
 * Gives a table explicit ARIA table roles, so it stays a table to screen readers when a narrow
 * layout shows its rows as blocks (CSS display changes can drop the implicit roles).
 */
export function keepTableRoles(table: HTMLTableElement): HTMLTableElement {
  table.setAttribute('role', 'table');
  for (const g of Array.from(table.querySelectorAll('thead, tbody'))) g.setAttribute('role', 'rowgroup');
  for (const tr of Array.from(table.querySelectorAll('tr'))) tr.setAttribute('role', 'row');
  for (const th of Array.from(table.querySelectorAll('thead th'))) th.setAttribute('role', 'columnheader');
  for (const th of Array.from(table.querySelectorAll('tbody th'))) th.setAttribute('role', 'rowheader');
  for (const td of Array.from(table.querySelectorAll('td'))) td.setAttribute('role', 'cell');
  return table;
}
