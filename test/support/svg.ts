/**
 * Reading an SVG string back in the chart tests: parsed as strict XML (xml2js), every element
 * listed depth first with its attributes, its text and its parent.
 */
const xml2js: { parseStringPromise(text: string, options?: object): Promise<Record<string, unknown>> } = require('xml2js');

export interface El {
  name: string;
  attrs: Record<string, string>;
  text: string;
  parent?: El;
}

/** Every element of the parsed document, depth first, with its attributes and text. */
export async function elements(svg: string): Promise<El[]> {
  const doc = await xml2js.parseStringPromise(svg, { strict: true });
  const out: El[] = [];
  const walk = (name: string, node: unknown, parent?: El): void => {
    if (typeof node === 'string') {
      out.push({ name, attrs: {}, text: node, parent });
      return;
    }
    const o = node as Record<string, unknown>;
    const el: El = { name, attrs: (o.$ as Record<string, string>) ?? {}, text: typeof o._ === 'string' ? o._ : '', parent };
    out.push(el);
    for (const [k, v] of Object.entries(o)) {
      if (k === '$' || k === '_') continue;
      for (const child of v as unknown[]) walk(k, child, el);
    }
  };
  const [rootName] = Object.keys(doc);
  walk(rootName, doc[rootName]);
  return out;
}

/** The elements carrying a class. */
export const byClass = (els: El[], cls: string): El[] => els.filter((e) => (e.attrs.class ?? '').split(' ').includes(cls));
