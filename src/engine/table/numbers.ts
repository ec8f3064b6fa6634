/**
 * Reading one number typed into the task pane (a coverage factor, an observed bias), without the
 * context of a file: files go through import/numbers.ts, which also reads unambiguous thousands
 * separators and decides "1,000" from the file's own evidence. A number here has at most
 * one separator, "." or ",", and that separator is the decimal mark: "5.7", "5,7", "-0,25",
 * "12", ".5", "1e-3". A trailing "%" is allowed (CVs are percent numbers: "5.7 %" is 5.7).
 * Thousands separators are refused ("1.234,5", "1,234.5", "1 234"): the file must say which
 * mark is decimal, and a guess could turn 1,234 into 1.234.
 */

const PLAIN = /^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$/;

/** The number a text cell holds, or undefined when it is not one number. */
export function readDecimal(text: string): number | undefined {
  let t = text.trim().replace(/\u00A0|\u202F/g, ' ');
  if (t.endsWith('%')) t = t.slice(0, -1).trimEnd();
  if (!PLAIN.test(t)) return undefined;
  const x = Number(t.replace(',', '.'));
  return Number.isFinite(x) ? x : undefined;
}
