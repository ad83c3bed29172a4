/**
 * The report as an XLSX workbook: Summary, one sheet per group of sections (impacts by sector and
 * measure, multipliers, linkages, sensitivity...), the inputs used and the notes. Numbers are
 * number cells with number formats (every digit kept); every text cell is neutralised as it is
 * set (src/io's `neutraliseText`). exceljs is loaded on first use (src/io's `loadExcel`, a
 * dynamic import), so that the report code can be bundled for the browser without it.
 */
import { loadExcel } from '../io/xlsx';
import { neutraliseCell } from './escape';
import type { Report } from './model';
import type { RowKind } from './sheets';
import { reportSheets } from './sheets';

const FONT: Partial<Record<RowKind, { bold?: boolean; italic?: boolean; size?: number; color?: { argb: string } }>> = {
  title: { bold: true, size: 14 },
  heading: { bold: true, size: 12 },
  about: { italic: true, color: { argb: 'FF5B5B61' } },
  header: { bold: true },
  total: { bold: true },
  note: { color: { argb: 'FF5B5B61' } },
  key: {},
};

/** The workbook's bytes. */
export async function writeXlsx(report: Report): Promise<Uint8Array> {
  const ExcelJS = await loadExcel();
  const wb = new ExcelJS.Workbook();
  const when = new Date(report.createdAt);
  wb.creator = `${report.tool.name} ${report.tool.version}`;
  wb.title = report.title;
  if (!Number.isNaN(when.getTime())) {
    wb.created = when;
    wb.modified = when;
  }
  for (const sheet of reportSheets(report)) {
    const ws = wb.addWorksheet(sheet.name);
    ws.columns = sheet.widths.map((w) => ({ width: w }));
    sheet.rows.forEach((r, k) => {
      const xr = ws.getRow(k + 1);
      r.cells.forEach((c, j) => {
        if (c.value === null || c.value === '') return;
        const xc = xr.getCell(j + 1);
        xc.value = typeof c.value === 'string' ? neutraliseCell(c.value) : c.value;
        if (typeof c.value === 'number' && c.numFmt) xc.numFmt = c.numFmt;
      });
      const font = FONT[r.kind];
      if (font && Object.keys(font).length) xr.font = font;
      if (r.kind === 'header') {
        xr.eachCell((c) => {
          c.fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFF0F0F3' } };
          c.border = { bottom: { style: 'thin' } };
          c.alignment = { wrapText: true, vertical: 'top' };
        });
      }
      if (r.kind === 'total') xr.eachCell((c) => (c.border = { top: { style: 'thin' } }));
      if (report.invented && sheet.name === 'Summary' && r.kind === 'note' && k < 4) xr.font = { bold: true, color: { argb: 'FF8A4B00' } };
    });
  }
  const buf = await wb.xlsx.writeBuffer();
  return new Uint8Array(buf as ArrayBuffer);
}
