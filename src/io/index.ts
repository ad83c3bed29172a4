/**
 * Reading and writing tables: the browser-safe public face of src/io (bytes and text in,
 * grids, tables and matrices out; writers to CSV, XLSX and JSON). Node-only helpers (paths,
 * streaming from disk, standard input) are in ./node.
 */
export { Grid, GridBuilder, gridFromRows, normalizeCode, normalizeLabel, numberText, EMPTY, NUMBER, TEXT } from './grid';
export type { Cell, CellKind, GridRow, MergeRange } from './grid';
export { analyseNumber, NumberReader, numberHint } from './numbers';
export type { DecimalMark, NumberConventions, NumberOptions } from './numbers';
export { decodeBytes, sniffBom } from './decode';
export type { Encoding, Decoded } from './decode';
export { DEFAULT_LIMITS, limitsOf, sizeText } from './limits';
export type { Limits } from './limits';
export { readCsv, readCsvStream, detectDelimiter, StreamingCsv, DELIMITERS, SCANNER_THRESHOLD } from './csv';
export type { CsvOptions, CsvRead, CsvConventions, Delimiter } from './csv';
export { readXlsx, openWorkbook, loadExcel, xlsxSheets } from './xlsx';
export type { XlsxOptions, XlsxRead, XlsxSheetInfo } from './xlsx';
export { zipEntries, checkZipSizes, verifyZipSizes, inflatePart } from './zip-guard';
export type { ZipEntry } from './zip-guard';
export { readLongCsv, readLongCsvStream, readLongGrid, SAMPLE_LINES, StreamingLong } from './long';
export type { LongOptions, LongTable } from './long';
export { DEFAULT_PATTERNS, resolvePatterns, globToRegExp } from './patterns';
export type { LayoutPatterns, PatternSet } from './patterns';
export { parseMapping, TABLE_KINDS, ROW_ROLES, COLUMN_ROLES } from './mapping';
export type { LayoutMapping, MappingInput, MappedRow, MappedColumn, RowRole, ColumnRole, TableKind, TotalCheck, RoleGiven } from './mapping';
export { detectStructure, metaFromTitles } from './layout';
export type { WideStructure } from './layout';
export { readTable, readMatrix, detectLayout } from './tables';
export type { TableSource, ReadTableOptions, TableRead, MatrixRead } from './tables';
export { readSupplyUse } from './supply-use';
export type { SupplyUseOptions, SupplyUseRead } from './supply-use';
export { readSatellites, attachSatellites } from './satellites';
export type { SatelliteOptions, SatelliteRead } from './satellites';
export { readConcordanceGrid, readConcordanceJson } from './concordance';
export type { ConcordanceRead } from './concordance';
export { readTableJson, readMatrixJson } from './json';
export { neutraliseText, restoreText } from './escape';
export {
  tableCells,
  matrixCells,
  cellsToCsv,
  writeTableCsv,
  writeMatrixCsv,
  writeWorkbook,
  writeTableXlsx,
  writeMatrixXlsx,
  writeTableJson,
  writeMatrixJson,
} from './write';
export type { LabelledMatrix, CsvWriteOptions, SheetSpec, XlsxTableOptions } from './write';
export { sniffFile, readGrid, guessShape, readTableFile, latestPeriod, readLongSheet } from './open';
export type { FileKind, GridOptions, GridRead, ReadFileOptions } from './open';
export { unpackKeyed, unpackIfKeyed } from './keyed';
export type { Unpacked } from './keyed';
export { crossCheckPublished, type PublishedComparison } from './published';
export { readLabelList, applyLabels } from './labels';
export { readTableCsvStream } from './open';
