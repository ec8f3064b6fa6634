/**
 * Writes the summary sheet and its chart of sigma by analyte in one batch: a single
 * sync whatever the number of analytes — the header lines, the whole table as one values array,
 * one number-format array per numeric column, and the chart. The caller picks a sheet name not
 * yet taken (paneHost.ts reads the names first).
 */
import type { SummaryRequest, SummaryResult } from '../host';
import { SUMMARY_HEADERS, summaryCells } from '../summaryRows';
import { columnLetters, needsTextGuard } from '../../engine/fill';

/** Text that Excel's parser would not keep as that text goes in with a leading apostrophe. */
export function cellValue(v: number | string): number | string {
  return typeof v === 'string' && v !== '' && needsTextGuard(v) ? `'${v}` : v;
}

const NUMBER_FORMATS: Readonly<Record<string, string>> = {
  Sigma: '0.00',
  'Allowable total error %': '0.00',
  'Bias %': '0.00',
  'CV %': '0.00',
  'Observed total error %': '0.00',
  Detection: '0.000',
  'False rejection per run': '0.000',
};

export async function writeSummarySheet(context: Excel.RequestContext, req: SummaryRequest): Promise<SummaryResult> {
  const name = req.sheetName;
  const sheet = context.workbook.worksheets.add(name);

  const top = req.header.length;
  sheet.getRange(`A1:A${top}`).values = req.header.map((l) => [cellValue(l)]);
  sheet.getRange('A1').format.font.bold = true;

  const headerRow = top + 2;
  const lastRow = headerRow + req.rows.length;
  const lastCol = columnLetters(SUMMARY_HEADERS.length);
  const tableAddress = `A${headerRow}:${lastCol}${lastRow}`;
  const values: Array<Array<number | string>> = [[...SUMMARY_HEADERS]];
  for (const r of req.rows) values.push(summaryCells(r).map(cellValue));
  sheet.getRange(tableAddress).values = values;
  sheet.getRange(`A${headerRow}:${lastCol}${headerRow}`).format.font.bold = true;
  if (req.rows.length) {
    SUMMARY_HEADERS.forEach((hname, i) => {
      const fmt = NUMBER_FORMATS[hname];
      if (!fmt) return;
      const col = columnLetters(i + 1);
      const rng = sheet.getRange(`${col}${headerRow + 1}:${col}${lastRow}`);
      rng.numberFormat = Array.from({ length: req.rows.length }, () => [fmt]);
    });
  }
  sheet.getRange(`A:A`).format.columnWidth = 140;

  const chartSeriesAddress = `A${headerRow}:B${lastRow}`;
  const chart = sheet.charts.add('BarClustered', sheet.getRange(chartSeriesAddress), 'Columns');
  chart.title.text = 'Sigma metric by analyte';
  chart.legend.visible = false;
  chart.setPosition(`${columnLetters(SUMMARY_HEADERS.length + 2)}${headerRow}`);
  sheet.activate();
  await context.sync();
  return { sheet: name, tableAddress, chartSeriesAddress };
}
