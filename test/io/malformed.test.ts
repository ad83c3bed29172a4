/**
 * A corpus of malformed files, generated here, each with the error it must produce: the code
 * (a word of our own), and a message that names the file, and where it applies the sheet, the
 * A1 cell with its row and column labels, and the text found. Every failure is an InputError;
 * nothing else may escape.
 */
import { deflateRawSync } from 'node:zlib';
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { aggregate } from '../../engine/aggregate';
import { InputError } from '../../engine/errors';
import { makeTable } from '../../engine/table';
import { readConcordanceGrid, readConcordanceJson } from '../../src/io/concordance';
import { readCsv } from '../../src/io/csv';
import { gridFromRows, type Cell } from '../../src/io/grid';
import { readTableJson } from '../../src/io/json';
import { readLongCsv } from '../../src/io/long';
import { parseMapping } from '../../src/io/mapping';
import { attachSatellites, readSatellites } from '../../src/io/satellites';
import { readSupplyUse } from '../../src/io/supply-use';
import { readTable } from '../../src/io/tables';
import { readXlsx } from '../../src/io/xlsx';

const enc = new TextEncoder();
const csvTable = (text: string, file: string, opts: Parameters<typeof readTable>[1] = {}) => readTable(readCsv(text, { file }).grid, opts);
const g = (rows: Cell[][], file: string) => gridFromRows(rows, file);

/** A minimal zip archive with given entries (deflated unless `stored`), and sizes that may lie. */
function zip(entries: { name: string; data: Uint8Array; declared?: number; stored?: boolean }[]): Uint8Array {
  const parts: Uint8Array[] = [];
  const central: Uint8Array[] = [];
  let offset = 0;
  for (const e of entries) {
    const comp = e.stored ? e.data : new Uint8Array(deflateRawSync(e.data));
    const name = enc.encode(e.name);
    const size = e.declared ?? e.data.length;
    const local = new DataView(new ArrayBuffer(30));
    local.setUint32(0, 0x04034b50, true);
    local.setUint16(4, 20, true);
    local.setUint16(8, e.stored ? 0 : 8, true);
    local.setUint32(18, comp.length, true);
    local.setUint32(22, size, true);
    local.setUint16(26, name.length, true);
    parts.push(new Uint8Array(local.buffer), name, comp);
    const c = new DataView(new ArrayBuffer(46));
    c.setUint32(0, 0x02014b50, true);
    c.setUint16(4, 20, true);
    c.setUint16(6, 20, true);
    c.setUint16(10, e.stored ? 0 : 8, true);
    c.setUint32(20, comp.length, true);
    c.setUint32(24, size, true);
    c.setUint16(28, name.length, true);
    c.setUint32(42, offset, true);
    central.push(new Uint8Array(c.buffer), name);
    offset += 30 + name.length + comp.length;
  }
  const cdSize = central.reduce((a, p) => a + p.length, 0);
  const end = new DataView(new ArrayBuffer(22));
  end.setUint32(0, 0x06054b50, true);
  end.setUint16(8, entries.length, true);
  end.setUint16(10, entries.length, true);
  end.setUint32(12, cdSize, true);
  end.setUint32(16, offset, true);
  const all = [...parts, ...central, new Uint8Array(end.buffer)];
  const out = new Uint8Array(all.reduce((a, p) => a + p.length, 0));
  let o = 0;
  for (const p of all) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

/** The workbook part and its relationships for one sheet at xl/worksheets/sheet1.xml (ECMA-376's minimum). */
const oneSheetWorkbook = [
  { name: 'xl/workbook.xml', data: enc.encode('<workbook xmlns:r="r"><sheets><sheet name="S" sheetId="1" r:id="rId1"/></sheets></workbook>') },
  { name: 'xl/_rels/workbook.xml.rels', data: enc.encode('<Relationships><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/></Relationships>') },
];

async function realXlsx(rows: Cell[][] = [['code', 'A'], ['A', 1]]): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Sheet1');
  for (const r of rows) ws.addRow(r);
  return new Uint8Array((await wb.xlsx.writeBuffer()) as ArrayBuffer);
}

interface Case {
  name: string;
  run: () => unknown;
  code: string;
  message: RegExp;
  cell?: string;
}

const good = 'code,A,B,HH\nA,1,2,10\nB,3,4,20\n';
const su = { make: [['', 'I1', 'I2'], ['I1', 1, 2], ['I2', 3, 4]] as Cell[][], use: [['', 'I1', 'I2', 'F1'], ['I1', 1, 1, 5], ['I2', 2, 2, 5], ['V1', 3, 3]] as Cell[][] };

const cases: Case[] = [
  // Files and text.
  { name: 'an empty file', run: () => readCsv(new Uint8Array(0), { file: 'e.csv' }), code: 'empty-file', message: /^file e\.csv is empty/ },
  { name: 'a byte-order mark alone', run: () => readCsv(Uint8Array.from([0xef, 0xbb, 0xbf]), { file: 'bom.csv' }), code: 'empty-file', message: /file bom\.csv is empty/ },
  { name: 'blank lines only', run: () => readCsv(' \n\n\t\r\n', { file: 'blank.csv' }), code: 'empty-file', message: /file blank\.csv is empty/ },
  { name: 'a binary file', run: () => readCsv(Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49]), { file: 'img.csv' }), code: 'not-text', message: /file img\.csv is not a text file/ },
  { name: 'a quoted field never closed', run: () => readCsv('a,b\n"x,1\n2,3\n', { file: 'q.csv' }), code: 'bad-quote', message: /file q\.csv, row 2: a quoted field is never closed/ },
  { name: 'a quoted field never closed (byte scanner)', run: () => readCsv(enc.encode('a,b\n"x,1\n2,3\n'), { file: 'q.csv', parser: 'scanner' }), code: 'bad-quote', message: /file q\.csv, row 2: a quoted field is never closed/ },
  { name: 'text after a closing quote', run: () => readCsv('a,b\n"x"y,1\n', { file: 'q2.csv' }), code: 'bad-quote', message: /row 2: a quoted field has text after its closing quote/ },
  { name: 'a file over the size limit', run: () => readCsv(good, { file: 'big.csv', limits: { maxBytes: 10 } }), code: 'too-large', message: /file big\.csv is \d+ B, over the limit of 10 B.*maxBytes/ },
  { name: 'more cells than the limit', run: () => readCsv(good, { file: 'cells.csv', limits: { maxCells: 5 } }), code: 'too-many-cells', message: /file cells\.csv has more than 5 cells/ },
  { name: 'bytes that are not UTF-8 when UTF-8 is required', run: () => readCsv(Uint8Array.from([0x61, 0x2c, 0xe9, 0x0a]), { file: 'u.csv', encoding: 'utf-8' }), code: 'bad-encoding', message: /file u\.csv is not valid utf-8/ },
  { name: 'an ambiguous 1,234', run: () => readCsv('x;y\nA;1,234\n', { file: 'amb.csv' }), code: 'ambiguous-number', message: /file amb\.csv, cell B2: '1,234' could be 1234/, cell: 'B2' },
  { name: 'decimal marks that disagree', run: () => readCsv('x;y;z\nA;1,5;2.5\n', { file: 'mix.csv' }), code: 'mixed-decimal', message: /cell B2 has '1,5'.*cell C2 has '2\.5'/, cell: 'C2' },
  { name: 'an unknown delimiter option', run: () => readCsv(good, { file: 'd.csv', delimiter: ':' as ',' }), code: 'bad-option', message: /delimiter must be one of/ },
  { name: 'an unknown decimal option', run: () => readCsv(good, { file: 'd.csv', decimal: ':' as '.' }), code: 'bad-option', message: /decimal mark must be '\.' or ','/ },

  // Layout and cells.
  { name: 'titles and no numbers', run: () => csvTable('Report\nNothing to see\n', 'none.csv'), code: 'no-numbers', message: /file none\.csv has no rows of numbers/ },
  { name: 'a header with no rows', run: () => csvTable('code,A,B\n', 'head.csv'), code: 'no-numbers', message: /file head\.csv has no rows of numbers/ },
  { name: 'a sector code twice down the side', run: () => csvTable('code,A,B\nA,1,2\nB,3,4\nA,5,6\n', 'dup.csv'), code: 'duplicate-code', message: /file dup\.csv: sector row code 'A' appears twice, in cell A2 and in cell A4/, cell: 'A4' },
  { name: 'a column code twice across the top', run: () => csvTable('code,A,B,B\nA,1,2,3\nB,3,4,5\n', 'dupc.csv'), code: 'duplicate-code', message: /sector column code 'B' appears twice, in cell C1 and in cell D1/ },
  { name: "'n/a' where a number belongs", run: () => csvTable('code,A,B\nA,1,2\nB,n/a,4\n', 'na.csv'), code: 'not-a-number', message: /file na\.csv, cell B3 \(row 'B', column 'A'\): text 'n\/a' where a number belongs in the intermediate block.*zeroTexts/, cell: 'B3' },
  { name: 'an empty cell in the intermediate block', run: () => csvTable('code,A,B\nA,1,\nB,3,4\n', 'blank.csv'), code: 'blank-cell', message: /file blank\.csv, cell C2 \(row 'A', column 'B'\) is empty, in the intermediate block.*blanks: 'zero'/, cell: 'C2' },
  { name: 'a negative number in parentheses', run: () => csvTable('code,A,B\nA,1,(2)\nB,3,4\n', 'par.csv'), code: 'not-a-number', message: /text '\(2\)'.*parentheses/ },
  { name: 'a percentage', run: () => csvTable('code,A,B\nA,1,2%\nB,3,4\n', 'pct.csv'), code: 'not-a-number', message: /text '2%'.*Percentages/ },
  { name: 'a currency symbol', run: () => csvTable('code,A,B\nA,1,$2\nB,3,4\n', 'cur.csv'), code: 'not-a-number', message: /text '\$2'.*Currency symbols/ },
  { name: 'a footnote mark after a number', run: () => csvTable('code,A,B\nA,1,2*\nB,3,4\n', 'fn.csv'), code: 'not-a-number', message: /text '2\*'.*footnote/ },
  { name: 'a row code with no column (a typo)', run: () => csvTable('code,AGR,MAN\nAGRI,1,2\nMAN,3,4\n', 'typo.csv'), code: 'row-without-column', message: /sector row 'AGRI' in cell A2 has no column with the same code/, cell: 'A2' },
  { name: 'a column code with no row between the sectors', run: () => csvTable('code,A,B,C\nA,1,2,3\nC,4,5,6\n', 'gap.csv', { mapping: { columns: { B: 'sector' } } }), code: 'column-without-row', message: /sector column 'B' in cell C1 has no row with the same code/ },
  { name: 'a satellite row without a unit', run: () => csvTable('code,A,B,x\nA,1,2,10\nB,3,4,20\nx,10,20\nJOBS,5,6\n', 'sat.csv'), code: 'no-unit', message: /satellite row 'JOBS' in cell A5 has no unit/ },
  { name: 'total output missing for a sector with flows', run: () => csvTable('code,A,B,x\nA,1,2,10\nB,3,4,\n', 'x.csv', { blanks: 'zero' }), code: 'missing-total', message: /file x\.csv, cell D3 \(row 'B', column 'x'\): total output \(column 'x'\) is empty for a sector with flows/, cell: 'D3' },
  { name: 'total output that is text', run: () => csvTable('code,A,B,x\nA,1,2,10\nB,3,4,lots\n', 'xt.csv'), code: 'not-a-number', message: /cell D3 .*text 'lots' where total output belongs/ },
  { name: 'the mapping takes output from a column that is not there', run: () => csvTable(good, 'mo.csv', { mapping: { output: { from: 'column', code: 'TOT' } } }), code: 'missing-total', message: /takes total output from a column coded 'TOT', but there is no such column/ },
  { name: 'everything ignored by the mapping', run: () => csvTable(good, 'ign.csv', { mapping: { rows: { A: 'ignore', B: 'ignore' } } }), code: 'no-sectors', message: /file ign\.csv: no sector rows were found/ },
  { name: 'a role written in the sheet that is not a role', run: () => readTable(g([['code', 'role', 'A'], ['A', 'sectr', 1]], 'role.csv')), code: 'bad-role', message: /row 'A' has role 'sectr' written in the sheet/ },
  { name: 'a use table read as a symmetric table', run: () => readTable(g(su.use, 'use.csv'), { kind: 'use' as 'flows' }), code: 'bad-option', message: /a use table is read with its partner by readSupplyUse/ },

  // Mappings.
  { name: 'a mapping file that is not JSON', run: () => parseMapping('{ rows: ', 'map.json'), code: 'bad-mapping', message: /file map\.json is not valid JSON/ },
  { name: 'a mapping with an unknown role', run: () => parseMapping('{ "rows": { "A": "sectr" } }', 'map.json'), code: 'bad-mapping', message: /mapping rows: 'A' has role 'sectr', which is not one of sector, value-added/ },
  { name: 'a mapping with an unknown pattern set', run: () => parseMapping('{ "patterns": { "finaldemand": {} } }', 'map.json'), code: 'bad-mapping', message: /patterns\.finaldemand is not known/ },
  { name: 'a mapping with a bad row number', run: () => parseMapping('{ "codeRow": 0 }', 'map.json'), code: 'bad-mapping', message: /codeRow must be a whole number from 1/ },
  { name: 'a mapping of another format', run: () => parseMapping('{ "format": "other" }', 'map.json'), code: 'bad-mapping', message: /format is 'other', not 'ripplewise-layout'/ },
  { name: 'a mapping naming a code the file does not have', run: () => csvTable(good, 'm.csv', { mapping: { columns: { XX: 'ignore' } } }), code: 'mapping-unknown-code', message: /the mapping sets columns 'XX', but the columns of file m\.csv have no such code/ },
  { name: 'a mapping row outside the sheet', run: () => csvTable(good, 'm.csv', { mapping: { codeRow: 40 } }), code: 'bad-mapping', message: /mapping codeRow is 40, outside the sheet/ },
  { name: 'a label pattern that is not a regular expression', run: () => csvTable(good, 'm.csv', { patterns: { totals: { labels: ['(('] } } }), code: 'bad-mapping', message: /patterns\.totals\.labels: '\(\(' is not a valid regular expression/ },

  // Supply-use.
  { name: 'make and use tables that disagree on industries', run: () => readSupplyUse(g(su.make, 'make.csv'), g([['', 'I1', 'I3', 'F1'], ['I1', 1, 1, 5], ['I2', 2, 2, 5]], 'use.csv')), code: 'codes-disagree', message: /disagree on industries: 1 industry of the use table \(file use\.csv\) is not in the make table \(file make\.csv\): 'I3'/, cell: 'C1' },
  { name: 'an industry of the make table with no column in the use table', run: () => readSupplyUse(g([['', 'I1', 'I2'], ['I1', 1, 2], ['I2', 3, 4], ['I3', 1, 1]], 'make.csv'), g(su.use, 'use.csv')), code: 'codes-disagree', message: /1 industry of the make table \(file make\.csv\) has no column in the use table.*'I3'/ },
  { name: 'a commodity of the make table with no row in the use table', run: () => readSupplyUse(g([['', 'I1', 'I2', 'C9'], ['I1', 1, 2, 1], ['I2', 3, 4, 1]], 'make.csv'), g(su.use, 'use.csv')), code: 'codes-disagree', message: /disagree on commodities: 1 commodity of the make table \(file make\.csv\) has no row in the use table.*'C9'/ },

  // Long files.
  { name: 'a long file with text in the value field', run: () => readLongCsv('A,A,1\nA,B,2\nB,A,abc\n', { file: 'l.csv', valueField: 3 }), code: 'not-a-number', message: /file l\.csv, line 3, field 3: text 'abc' where the value belongs \(row 'B', column 'A'\)/, cell: 'C3' },
  { name: 'a long file with a pair twice', run: () => readLongCsv('A,A,1\nA,B,2\nA,B,3\n', { file: 'd.csv' }), code: 'duplicate-entry', message: /file d\.csv, line 3: row 'A', column 'B' is given a second time.*duplicates: 'sum'/ },
  { name: 'a long file with an empty code', run: () => readLongCsv('A,A,1\n,B,2\n', { file: 'c.csv' }), code: 'empty-code', message: /file c\.csv, line 2: the code in field 1 is empty/ },
  { name: 'a long file with a header and nothing else', run: () => readLongCsv('row,column,value\n', { file: 'h.csv' }), code: 'no-rows', message: /file h\.csv has a header line but no data lines/ },
  { name: 'a value field beyond the fields', run: () => readLongCsv('A,A,1\nA,B,2\n', { file: 'v.csv', valueField: 9 }), code: 'bad-option', message: /file v\.csv has 3 fields per line; there is no field 9/ },
  { name: 'a long file with a short line', run: () => readLongCsv('A,A,1\nA,B,2\nA\n', { file: 's.csv' }), code: 'short-line', message: /file s\.csv, line 3 has 1 field; 3 are needed/ },
  { name: 'numbers that never change: no field can be the value', run: () => readLongCsv('A,A,3,1997\nA,B,3,1997\n', { file: 'k.csv' }), code: 'value-field-ambiguous', message: /fields 3, 4 hold numbers, but each holds the same number on every line/ },
  { name: 'a long file with an empty value', run: () => readLongCsv('A,A,1\nA,B,\n', { file: 'b.csv', valueField: 3 }), code: 'blank-cell', message: /file b\.csv, line 2: the value \(field 3\) is empty for row 'A', column 'B'/ },
  { name: 'a long file with no numbers', run: () => readLongCsv('A,A,x\nA,B,y\n', { file: 'n.csv' }), code: 'no-value-field', message: /file n\.csv: no field holds numbers on every line/ },
  { name: 'a long file of one field', run: () => readLongCsv('A\nB\n', { file: 'one.csv' }), code: 'no-code-fields', message: /file one\.csv: two fields of codes/ },

  // Workbooks.
  { name: 'a workbook that is not a zip', run: () => readXlsx(enc.encode('hello, I am not a workbook at all'), { file: 'n.xlsx' }), code: 'not-xlsx', message: /file n\.xlsx is not an XLSX workbook/ },
  { name: 'an old Excel 97-2003 workbook', run: () => readXlsx(Uint8Array.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, 0, 0, 0, 0]), { file: 'old.xls' }), code: 'xls-not-supported', message: /file old\.xls is an old Excel 97-2003 workbook/ },
  { name: 'a workbook cut short', run: async () => { const b = await realXlsx(); return readXlsx(b.subarray(0, Math.floor(b.length / 2)), { file: 'cut.xlsx' }); }, code: 'bad-xlsx', message: /file cut\.xlsx is not a readable XLSX workbook: the zip directory is missing/ },
  { name: 'a zip that would expand past the limit', run: () => readXlsx(zip([{ name: 'xl/workbook.xml', data: enc.encode('<x/>'), declared: 3_000_000_000 }]), { file: 'bomb.xlsx' }), code: 'xlsx-expands-too-far', message: /file bomb\.xlsx would expand to more than 2\.15 GB/ },
  { name: 'a zip part with a compression ratio of a zip bomb', run: () => readXlsx(zip([{ name: 'xl/worksheets/sheet1.xml', data: new Uint8Array(30 * 1024 * 1024) }, { name: 'xl/workbook.xml', data: enc.encode('<x/>') }]), { file: 'ratio.xlsx' }), code: 'xlsx-expands-too-far', message: /part 'xl\/worksheets\/sheet1\.xml' expands \d+ times/ },
  { name: 'a zip part that inflates past its declared size', run: () => readXlsx(zip([{ name: 'xl/worksheets/sheet1.xml', data: new Uint8Array(5 * 1024 * 1024), declared: 1000 }, ...oneSheetWorkbook]), { file: 'liar.xlsx' }), code: 'xlsx-expands-too-far', message: /part 'xl\/worksheets\/sheet1\.xml' expands past the 1\.0 kB its directory declares/ },
  { name: 'a zip that is not a workbook', run: () => readXlsx(zip([{ name: 'readme.txt', data: enc.encode('hi'), stored: true }]), { file: 'z.xlsx' }), code: 'not-xlsx', message: /file z\.xlsx is a zip archive but not an XLSX workbook \(it has no xl\/workbook\.xml\)/ },
  { name: 'a sheet name the workbook does not have', run: async () => readXlsx(await realXlsx(), { file: 'w.xlsx', sheet: 'Nope' }), code: 'unknown-sheet', message: /file w\.xlsx has no sheet 'Nope'; its sheets are 'Sheet1'/ },
  { name: 'a sheet number past the last', run: async () => readXlsx(await realXlsx(), { file: 'w.xlsx', sheet: 3 }), code: 'unknown-sheet', message: /file w\.xlsx has no sheet 3; it has 1 sheet: 'Sheet1'/ },
  { name: 'an empty sheet', run: async () => readXlsx(await realXlsx([]), { file: 'e.xlsx' }), code: 'empty-file', message: /file e\.xlsx, sheet 'Sheet1' has no cells/ },
  { name: 'a workbook over the size limit', run: async () => readXlsx(await realXlsx(), { file: 'w.xlsx', limits: { maxXlsxBytes: 100 } }), code: 'too-large', message: /file w\.xlsx is .* over the limit of 100 B.*maxXlsxBytes/ },
  { name: 'a workbook cell with text in the table', run: async () => readTable((await readXlsx(await realXlsx([['code', 'A', 'B'], ['A', 1, 'x'], ['B', 2, 3]]), { file: 'c.xlsx' })).grid), code: 'not-a-number', message: /file c\.xlsx, sheet 'Sheet1', cell C2 \(row 'A', column 'B'\): text 'x'/, cell: 'C2' },

  // JSON.
  { name: 'a JSON table of another format', run: () => readTableJson('{"format":"other"}', 't.json'), code: 'bad-json', message: /file t\.json: format is 'other'/ },
  { name: 'a JSON table with null for a number', run: () => readTableJson('{"sectors":{"codes":["A","B"]},"Z":[[1,null],[1,2]]}', 't.json'), code: 'bad-json', message: /file t\.json: Z row 1 \('A'\), value 2: null where a number belongs/ },
  { name: 'a JSON file that is not JSON', run: () => readTableJson('{"sectors":', 't.json'), code: 'bad-json', message: /file t\.json is not valid JSON/ },
  { name: 'a JSON table whose Z is the wrong size', run: () => readTableJson('{"sectors":{"codes":["A","B"]},"Z":[[1,2]]}', 't.json'), code: 'bad-json', message: /Z has 1 rows; 2 are needed/ },
  { name: 'a JSON table with a duplicate code', run: () => readTableJson('{"sectors":{"codes":["A","A"]},"Z":[[1,2],[3,4]]}', 't.json'), code: 'duplicate-code', message: /file t\.json: sector code 'A' appears twice/ },

  // Concordances and aggregation.
  { name: 'a concordance that maps a code to two groups', run: () => readConcordanceGrid(g([['from', 'to'], ['A', 'G1'], ['B', 'G1'], ['A', 'G2']], 'c.csv')), code: 'not-many-to-one', message: /file c\.csv: code 'A' is mapped to 'G1' \(row 2\) and to 'G2' \(row 4\)/ },
  { name: 'a concordance line without a group', run: () => readConcordanceGrid(g([['A', 'G1'], ['B', null]], 'c.csv')), code: 'empty-code', message: /file c\.csv, row 2: code 'B' has no group/ },
  { name: 'a concordance of one column', run: () => readConcordanceGrid(g([['A'], ['B']], 'c.csv')), code: 'bad-concordance', message: /file c\.csv has one column/ },
  { name: 'a concordance in JSON that is not one', run: () => readConcordanceJson('{"map": ["A"]}', 'c.json'), code: 'bad-concordance', message: /file c\.json: map must be an object of code to group/ },
  { name: 'aggregating with a code the table does not have', run: () => aggregate(makeTable({ sectors: { codes: ['A', 'B'] }, Z: [[1, 2], [3, 4]] }), { from: ['A', 'B', 'Q'], to: ['G', 'G', 'G'] }), code: 'unknown-sector', message: /maps 1 code that is not a sector of the table: 'Q'/ },
  { name: 'aggregating with a sector left out', run: () => aggregate(makeTable({ sectors: { codes: ['A', 'B'] }, Z: [[1, 2], [3, 4]] }), { from: ['A'], to: ['G'] }), code: 'unmapped-sector', message: /1 sector of the table is not in the concordance: 'B'/ },
  { name: 'aggregating a table of coefficients without outputs', run: () => aggregate(makeTable({ sectors: { codes: ['A'] }, Z: [[0.1]], x: [1], meta: { outputAssumed: true } }), { from: ['A'], to: ['G'] }), code: 'aggregate-coefficients', message: /read from technical coefficients without total output/ },
  { name: 'aggregating into a listed group with no member', run: () => aggregate(makeTable({ sectors: { codes: ['A'] }, Z: [[1]] }), { from: ['A'], to: ['G'], groups: { codes: ['G', 'H'], labels: ['G', 'H'] } }), code: 'empty-group', message: /1 group has no sector: 'H'/ },

  // Satellites.
  { name: 'a satellite sheet without units', run: () => readSatellites(g([['code', 'A', 'B'], ['EMP', 1, 2]], 's.csv')), code: 'no-unit', message: /file s\.csv: satellite 'EMP' has no unit/ },
  { name: 'satellites for a sector the table does not have', run: () => attachSatellites(makeTable({ sectors: { codes: ['A'] }, Z: [[1]] }), { satellites: [{ code: 'E', label: 'E', unit: 'jobs', values: Float64Array.of(1) }], sectors: { codes: ['Z'], labels: ['Z'] } }), code: 'unknown-sector', message: /the satellite sheet has 1 sector code that the table does not: 'Z'/ },
];

describe(`a corpus of ${cases.length} malformed files, each with the message it must produce`, () => {
  it('has at least 50 files', () => expect(cases.length).toBeGreaterThanOrEqual(50));
  for (const c of cases) {
    it(c.name, async () => {
      let err: unknown;
      try {
        await c.run();
      } catch (e) {
        err = e;
      }
      expect(err, 'it must fail').toBeInstanceOf(InputError);
      const e = err as InputError;
      expect(e.code).toBe(c.code);
      expect(e.message).toMatch(c.message);
      if (c.cell) expect(e.where.cell).toBe(c.cell);
    });
  }
});
