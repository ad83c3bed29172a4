/** One entry point for every format: text for HTML, CSV and JSON, bytes for XLSX. */
import { writeCsv } from './csv';
import { writeHtml } from './html';
import { writeJson } from './json';
import type { Report } from './model';
import { writeXlsx } from './xlsx';

export type ReportFormat = 'html' | 'xlsx' | 'csv' | 'json';
export const REPORT_FORMATS: readonly ReportFormat[] = ['html', 'xlsx', 'csv', 'json'];

/** The report in a format: a string (UTF-8 text) or, for XLSX, bytes. */
export async function writeReport(report: Report, format: ReportFormat, options: { locale?: string } = {}): Promise<string | Uint8Array> {
  switch (format) {
    case 'html':
      return writeHtml(report, options);
    case 'xlsx':
      return writeXlsx(report);
    case 'csv':
      return writeCsv(report);
    case 'json':
      return writeJson(report);
  }
}
