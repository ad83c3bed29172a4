/**
 * Reports: one model built from engine results (model.ts) and one writer per format. Browser-safe:
 * no node: import anywhere under src/report; exceljs is imported on first use by the XLSX writer.
 */
export * from './model';
export * from './format';
export * from './escape';
export * from './sha256';
export { REPORT_CSS, reportCsp, tableHtml, writeHtml } from './html';
export type { HtmlOptions } from './html';
export { writeXlsx } from './xlsx';
export { writeCsv } from './csv';
export { writeJson } from './json';
export { reportSheets, tableRows, textCell } from './sheets';
export type { LayoutCell, LayoutRow, RowKind, SheetLayout } from './sheets';
export { writeReport, REPORT_FORMATS } from './write';
export type { ReportFormat } from './write';
