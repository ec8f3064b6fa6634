/**
 * An SVG document made as a string by src/charts (shared with the command line) turned into a
 * node of the pane, without innerHTML: parsed as XML by the browser and imported. The drawing's
 * text arrives escaped and its styling as presentation attributes, which the pane's
 * Content-Security-Policy allows.
 */
export function svgNode(svg: string): Element {
  const doc = new DOMParser().parseFromString(svg, 'image/svg+xml');
  const root = doc.documentElement;
  if (root.nodeName !== 'svg' || doc.getElementsByTagName('parsererror').length) throw new Error('the chart could not be drawn');
  return document.importNode(root, true);
}
