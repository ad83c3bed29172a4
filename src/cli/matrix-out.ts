/**
 * Writers for a labelled matrix (coefficients, total requirements), all through src/io: a wide
 * CSV or TSV with the row codes in the first column and the column codes in the header row
 * (`cellsToCsv`), an XLSX workbook of the same shape with sheets stating the titles, unit, inputs
 * and cautions (`writeWorkbook`), JSON (`writeMatrixJson`), and an HTML report.
 */
import type { Matrix } from '../../engine/linalg/matrix';
import type { Axis } from '../../engine/table';
import type { Cell } from '../io/grid';
import { cellsToCsv, writeMatrixJson, writeWorkbook } from '../io/write';
import type { Report } from '../report/model';
import type { OutputFormat } from './files';
import type { Writer } from './output';

export interface LabelledMatrix {
  /** What the matrix is: `technical coefficients`, `industry-by-commodity total requirements`. */
  title: string;
  about: string;
  rows: Axis;
  cols: Axis;
  matrix: Matrix;
  /** The unit of every entry. */
  unit: string;
  /** The top-left header cell: what the rows and columns are, such as `industry/commodity`. */
  corner: string;
}

/** The wide grid: a header row of the column codes, then one row per row code with its values. */
export function wideCells(m: LabelledMatrix): Cell[][] {
  const out: Cell[][] = [[m.corner, ...m.cols.codes]];
  const { rows, cols, data } = m.matrix;
  for (let i = 0; i < rows; i++) {
    const r: Cell[] = [m.rows.codes[i]!];
    for (let j = 0; j < cols; j++) r.push(data[i * cols + j]!);
    out.push(r);
  }
  return out;
}

export function matrixCsv(m: LabelledMatrix, delimiter: ',' | '\t' = ','): string {
  return cellsToCsv(wideCells(m), { delimiter });
}

export function matrixXlsx(m: LabelledMatrix, about: Record<string, string>): Promise<Uint8Array> {
  const codes: Cell[][] = [['axis', 'code', 'title']];
  m.rows.codes.forEach((c, i) => codes.push(['row', c, m.rows.labels[i] ?? c]));
  m.cols.codes.forEach((c, i) => codes.push(['column', c, m.cols.labels[i] ?? c]));
  return writeWorkbook([
    { name: 'Matrix', rows: wideCells(m), numberFormat: '0.000000', freezeRows: 1, freezeColumns: 1, widths: [12] },
    { name: 'About', rows: Object.entries({ matrix: m.title, about: m.about, unit: m.unit, rows: m.corner, ...about }).map(([k, v]) => [k, v]), widths: [24, 110] },
    { name: 'Codes', rows: codes, widths: [8, 12, 60] },
  ]);
}

/** Every format a matrix result can be written in. */
export function matrixWriters(m: LabelledMatrix, report: () => Report, about: Record<string, string>): Partial<Record<OutputFormat, Writer>> {
  return {
    csv: () => matrixCsv(m),
    tsv: () => matrixCsv(m, '\t'),
    xlsx: () => matrixXlsx(m, about),
    json: () => writeMatrixJson({ rows: m.rows, cols: m.cols, matrix: m.matrix, title: m.title, description: `${m.about} Unit: ${m.unit}.` }, 1) + '\n',
    html: async () => (await import('../report/html')).writeHtml(report()),
  };
}

/** The matrix as plain JSON for --json. */
export function matrixJson(m: LabelledMatrix) {
  const values: number[][] = [];
  for (let i = 0; i < m.matrix.rows; i++) values.push(Array.from(m.matrix.data.subarray(i * m.matrix.cols, (i + 1) * m.matrix.cols)));
  return { title: m.title, about: m.about, unit: m.unit, rows: m.rows, cols: m.cols, values };
}
