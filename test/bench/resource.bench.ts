/**
 * Bounded and quick, in one run (`npm run bench -- resource`):
 * - the streaming XLSX reader against exceljs's load on the same published workbook (Scottish
 *   Government IO2016.xlsx: a sheet chosen by content, and one named sheet), target ≥ 5× faster;
 * - start-up of the compiled command against the tsx path (`--help`, and `multipliers` on the
 *   demo table), whole process, targets ≤ 0.15 s and ≤ 0.3 s, beside `node -e 0` on this machine;
 * - peak memory and time of a large generated XLSX sheet, a large wide CSV and a wide sheet of
 *   3 rows × many columns, each read in a child process of its own (sizes by BENCH_SCALE).
 * Generated files go to the temporary folder (RIPPLEWISE_BENCH_TMP moves it).
 */
import { spawnSync } from 'node:child_process';
import { closeSync, existsSync, mkdirSync, openSync, readFileSync, rmSync, statSync, writeFileSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { zipSync } from 'fflate';
import { openWorkbook, readXlsx } from '../../src/io/xlsx';
import { REFERENCE_DIR } from '../helpers/reference';
import { table, target, timeMedianAsync } from './util';

const ROOT = resolve(import.meta.dirname, '../..');
const SCALE = Number(process.env.BENCH_SCALE ?? 1);
const DIR = join(process.env.RIPPLEWISE_BENCH_TMP ?? tmpdir(), 'ripplewise-resource-bench');
mkdirSync(DIR, { recursive: true });

// 1. Reader speed.
const io2016 = join(REFERENCE_DIR, 'scotland-2016-io', 'IO2016.xlsx');
if (existsSync(io2016)) {
  const bytes = new Uint8Array(readFileSync(io2016));
  const chosen = await timeMedianAsync(() => readXlsx(bytes, { file: 'IO2016.xlsx' }), 5);
  const named = await timeMedianAsync(() => readXlsx(bytes, { file: 'IO2016.xlsx', sheet: 'IxI' }), 5);
  const excel = await timeMedianAsync(() => openWorkbook(bytes, 'IO2016.xlsx'), 3);
  table(['IO2016.xlsx (0.8 MB)', 'ms'], [['streaming reader, sheet chosen by content', chosen], ['streaming reader, sheet IxI', named], ['exceljs load (before any cell is read)', excel]]);
  target('reader ≥ 5× faster than exceljs (named sheet)', excel / named >= 5, `${(excel / named).toFixed(1)}×`);
  target('reader ≥ 5× faster than exceljs (sheet chosen by content)', excel / chosen >= 5, `${(excel / chosen).toFixed(1)}×`);
} else console.log(`(IO2016.xlsx not found in ${REFERENCE_DIR}; reader comparison skipped)`);

// 2. Start-up.
function wall(args: string[], env: Record<string, string> = {}, runs = 5): number {
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const s = performance.now();
    const r = spawnSync(process.execPath, args, { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'ignore', 'pipe'] });
    t.push(performance.now() - s);
    if (r.status !== 0 && !args.includes('-e')) console.log(`(exit ${r.status}: ${r.stderr.toString().slice(0, 200)})`);
  }
  t.sort((a, b) => a - b);
  return t[Math.floor(t.length / 2)]! / 1000;
}
spawnSync(process.execPath, ['scripts/build-cli.mjs'], { cwd: ROOT, stdio: 'ignore' });
const bin = join(ROOT, 'bin/ripplewise.mjs');
const demo = ['multipliers', 'data-demo/vellan-coast.csv'];
const base = wall(['-e', '0']);
const help = wall([bin, '--help']);
const helpTsx = wall([bin, '--help'], { RIPPLEWISE_SOURCES: '1' }, 3);
const mult = wall([bin, ...demo]);
const multTsx = wall([bin, ...demo], { RIPPLEWISE_SOURCES: '1' }, 3);
table(['start-up (whole process, median)', 's'], [['node -e 0 (this machine now)', base], ['ripplewise --help, compiled', help], ['ripplewise --help, tsx', helpTsx], ['multipliers demo, compiled', mult], ['multipliers demo, tsx', multTsx]]);
target('--help ≤ 0.15 s', help <= 0.15, `${help.toFixed(3)} s; node alone ${base.toFixed(3)} s`);
target('multipliers on the demo ≤ 0.3 s', mult <= 0.3, `${mult.toFixed(3)} s`);

// 3. Large and wide inputs, each in its own process.
function child(code: string, timeoutMs = 300_000): { ms: number; rssMB: number; out: string } {
  const file = join(ROOT, 'test/bench/.child.mts');
  writeFileSync(file, `${code}\nconsole.log(JSON.stringify({ rss: process.resourceUsage().maxRSS / 1024 }));\n`);
  const s = performance.now();
  const r = spawnSync(process.execPath, ['--import', 'tsx', file], { cwd: ROOT, encoding: 'utf8', timeout: timeoutMs });
  const ms = performance.now() - s;
  const last = (r.stdout ?? '').trim().split('\n').pop() ?? '';
  let rssMB = NaN;
  try {
    rssMB = JSON.parse(last).rss;
  } catch {
    /* killed or failed */
  }
  return { ms, rssMB, out: r.status === 0 ? (r.stdout ?? '').trim().split('\n').slice(0, -1).join(' ') : `exit ${r.status ?? r.signal}: ${(r.stderr ?? '').slice(-300)}` };
}

const N = Math.round(2000 * Math.sqrt(SCALE));
const bigXlsx = join(DIR, `sheet-${N}.xlsx`);
if (!existsSync(bigXlsx)) {
  const enc = new TextEncoder();
  const rows: string[] = ['<worksheet><sheetData>'];
  for (let r = 1; r <= N; r++) {
    let row = `<row r="${r}">`;
    for (let c = 0; c < N; c++) row += `<c><v>${((r * 7919 + c * 104729) % 100000) / 1000}</v></c>`;
    rows.push(row + '</row>');
  }
  rows.push('</sheetData></worksheet>');
  const sheet = enc.encode(rows.join(''));
  writeFileSync(
    bigXlsx,
    zipSync({
      'xl/workbook.xml': enc.encode('<workbook xmlns:r="r"><sheets><sheet name="Data" sheetId="1" r:id="rId1"/></sheets></workbook>'),
      'xl/_rels/workbook.xml.rels': enc.encode('<Relationships><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/></Relationships>'),
      'xl/worksheets/sheet1.xml': sheet,
    }),
  );
  console.log(`generated ${bigXlsx}: ${N} × ${N} cells, sheet XML ${(sheet.length / 1e6).toFixed(0)} MB`);
}
const xl = child(`import { readFileSync } from 'node:fs'; import { readXlsx } from '../../src/io/xlsx'; const x = await readXlsx(new Uint8Array(readFileSync(${JSON.stringify(bigXlsx)})), { file: 'big.xlsx', sheet: 1 }); console.log(x.grid.rowCount + ' rows');`);

const W = 20_000 * SCALE;
const wideCsv = join(DIR, `wide-${W}.csv`);
if (!existsSync(wideCsv)) {
  const head = ['code', ...Array.from({ length: W }, (_, j) => `F${j}`)];
  const lines = [head.join(','), ['A', ...Array.from({ length: W }, (_, j) => String(j % 10))].join(','), ['B', ...Array.from({ length: W }, (_, j) => String((j + 3) % 10))].join(',')];
  writeFileSync(wideCsv, lines.join('\n') + '\n');
}
const wide = child(`import { readFileSync } from 'node:fs'; import { readTableFile } from '../../src/io/open'; try { const r = await readTableFile(new Uint8Array(readFileSync(${JSON.stringify(wideCsv)})), { file: 'wide.csv' }); console.log('read'); } catch (e) { console.log('refused: ' + String((e as Error).message).slice(0, 120)); }`, 120_000);

const CN = Math.round(3000 * Math.sqrt(SCALE));
const bigCsv = join(DIR, `wide-${CN}x${CN}.csv`);
if (!existsSync(bigCsv)) {
  const parts: string[] = [['code', ...Array.from({ length: CN }, (_, j) => `S${j}`)].join(',')];
  for (let i = 0; i < CN; i++) parts.push([`S${i}`, ...Array.from({ length: CN }, (_, j) => (((i * 31 + j * 17) % 1000) / 10).toFixed(1))].join(','));
  writeFileSync(bigCsv, parts.join('\n') + '\n');
}
const csv = child(`import { readCsvFile } from '../../src/io/node'; const r = await readCsvFile(${JSON.stringify(bigCsv)}); console.log(r.grid.rowCount + ' rows');`);

table(
  ['large and wide inputs (own process)', 'ms', 'peak MB', 'result'],
  [
    [`XLSX sheet ${N} × ${N}`, xl.ms, xl.rssMB, xl.out],
    [`CSV ${CN} × ${CN} (readCsvFile)`, csv.ms, csv.rssMB, csv.out],
    [`CSV 3 rows × ${W} columns (readTableFile)`, wide.ms, wide.rssMB, wide.out],
  ],
);
const matrixMB = (N * N * 9) / 1e6;
target(`XLSX peak memory within 3× the grid (${matrixMB.toFixed(0)} MB of values and kinds) plus the file`, xl.rssMB <= 3 * matrixMB + 200, `${xl.rssMB.toFixed(0)} MB`);

// 4. A CSV table of ~600 MB (BENCH_SCALE scales it) through the command's reading path
// (src/cli/table-input.ts loadTable: streamed from disk through the byte scanner, hashed as the
// chunks pass), against the whole-file path on the same file (read whole, then readTableFile),
// each in a process of its own; the file is made in the temporary folder and deleted afterwards.
{
  const n = Math.min(10_000, Math.round(Number(process.env.BENCH_CSV_SECTORS ?? 9000) * Math.sqrt(SCALE)));
  const file = join(DIR, `table-${n}.csv`);
  const started = performance.now();
  const fd = openSync(file, 'w');
  writeSync(fd, ['code', 'label', ...Array.from({ length: n }, (_, j) => `S${j}`), 'HH', 'x'].join(',') + '\n');
  for (let i = 0; i < n; i++) {
    let row = `S${i},"Sector ${i}, invented"`;
    let sum = 0;
    for (let j = 0; j < n; j++) {
      const v = ((i * 7919 + j * 104729) % 100000) / 1000;
      sum += v;
      row += `,${v}`;
    }
    writeSync(fd, `${row},100,${(sum + 100).toFixed(3)}\n`);
  }
  writeSync(fd, ['VA', 'Value added', ...Array.from({ length: n }, () => '1000'), '', ''].join(',') + '\n');
  closeSync(fd);
  const size = statSync(file).size;
  console.log(`generated ${file}: ${n} sectors, ${(size / 1e6).toFixed(0)} MB in ${((performance.now() - started) / 1000).toFixed(1)} s`);
  const f = JSON.stringify(file);
  const streamed = child(`import { processContext } from '../../src/cli/context'; import { loadTable } from '../../src/cli/table-input'; const t = await loadTable(processContext(), ${f}, {}); console.log(t.table.sectors.codes.length + ' sectors, sha256 ' + t.file.sha256.slice(0, 12));`, 600_000);
  const whole = child(`import { processContext } from '../../src/cli/context'; import { readInput } from '../../src/cli/files'; import { readTableFile } from '../../src/io/open'; const b = await readInput(processContext(), ${f}, 'table'); const t = await readTableFile(b.bytes, { file: 'table.csv' }); console.log(t.table.sectors.codes.length + ' sectors, sha256 ' + b.sha256.slice(0, 12));`, 600_000);
  rmSync(file);
  const matrixMB = (n * n * 8) / 1e6;
  table(
    [`CSV ${(size / 1e6).toFixed(0)} MB, ${n} sectors (own process, incl. tsx)`, 'ms', 'peak MB', 'result'],
    [
      ['streamed (the command: loadTable)', streamed.ms, streamed.rssMB, streamed.out],
      ['whole file (readInput + readTableFile)', whole.ms, whole.rssMB, whole.out],
    ],
  );
  target(`large CSV peak memory within 3× the matrix bytes (${matrixMB.toFixed(0)} MB)`, streamed.rssMB <= 3 * matrixMB, `${streamed.rssMB.toFixed(0)} MB = ${(streamed.rssMB / matrixMB).toFixed(2)}×`);
}
