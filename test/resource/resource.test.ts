/**
 * Bounded, safe input and output: each case of a hostile or oversized input at a small,
 * CI-friendly size, with a bounded time, and each must end in a clear message (exit 2 or 1),
 * never a crash, a hang or a lost file. FUZZ_SCALE=10 makes every case ten times larger.
 * Timings are not asserted here (they are in test/bench/resource.bench.ts); the test timeouts
 * only stop a hang.
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { zipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../engine/errors';
import { makeTable } from '../../engine/table';
import { errorReport, faultId } from '../../src/cli/errors';
import { findInfinite, rangeFindings } from '../../src/cli/finite';
import { terminalSafe } from '../../src/cli/text';
import { readLongCsv } from '../../src/io/long';
import { readTable } from '../../src/io/tables';
import { checkJsonDepth, parseLimits } from '../../src/io/limits';
import { readXlsx } from '../../src/io/xlsx';
import { TWO_SECTORS } from '../cli/fixtures';
import { run, tempDir } from '../cli/harness';

const SCALE = Number(process.env.FUZZ_SCALE ?? 1);
const enc = new TextEncoder();

function thrown(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    return e as InputError;
  }
  throw new Error('expected an error');
}

async function rejected(p: Promise<unknown>): Promise<InputError> {
  try {
    await p;
  } catch (e) {
    return e as InputError;
  }
  throw new Error('expected an error');
}

/** A minimal workbook (ECMA-376 parts) with one sheet of XML. */
function workbook(sheetXml: string, extra: Record<string, Uint8Array> = {}, level: 0 | 6 = 6): Uint8Array {
  return zipSync(
    {
      '[Content_Types].xml': enc.encode('<Types/>'),
      'xl/workbook.xml': enc.encode('<workbook xmlns:r="r"><sheets><sheet name="Data" sheetId="1" r:id="rId1"/></sheets></workbook>'),
      'xl/_rels/workbook.xml.rels': enc.encode('<Relationships><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/></Relationships>'),
      'xl/worksheets/sheet1.xml': enc.encode(sheetXml),
      ...extra,
    },
    { level },
  );
}

function sheetOf(rows: number, cols: number): string {
  const parts = ['<worksheet><sheetData>'];
  for (let r = 1; r <= rows; r++) {
    parts.push(`<row r="${r}">`);
    for (let c = 0; c < cols; c++) parts.push(`<c><v>${(r * 31 + c) % 997}</v></c>`);
    parts.push('</row>');
  }
  parts.push('</sheetData></worksheet>');
  return parts.join('');
}

describe('reading stays bounded', () => {
  it('a long file naming 20,000 codes is refused before its dense matrix is made', () => {
    const n = 20_000 * SCALE;
    const lines = ['row,col,value'];
    for (let i = 0; i < n; i++) lines.push(`R${i},C${i},1`);
    const e = thrown(() => readTable(readLongCsv(lines.join('\n'), { file: 'codes.csv' })));
    expect(e.code).toBe('too-large');
    expect(e.message).toMatch(/file codes\.csv has 20,000|file codes\.csv has \d[\d,]* row codes/);
    expect(e.message).toMatch(/raise the limit \(maxCells; on the command line RIPPLEWISE_LIMITS=maxCells=N\)/);
  }, 60_000);

  it('a workbook sheet stops at the cell limit as it is read, naming the limit', async () => {
    const n = 300 * Math.sqrt(SCALE);
    const bytes = workbook(sheetOf(Math.round(n), Math.round(n)));
    const e = await rejected(readXlsx(bytes, { file: 'big.xlsx', limits: { maxCells: 10_000 } }));
    expect(e.code).toBe('too-many-cells');
    expect(e.message).toMatch(/file big\.xlsx has more than 10,000 cells, over the limit/);
    expect(e.message).toMatch(/maxCells/);
    // Under the limit the same sheet reads whole.
    const ok = await readXlsx(bytes, { file: 'big.xlsx' });
    expect(ok.grid.rowCount).toBe(Math.round(n));
    expect(ok.grid.num(1, 2)).toBe((2 * 31 + 2) % 997);
  }, 60_000);

  it('many small parts that each expand a thousand times are refused together (the ratio counts every part)', async () => {
    const parts: Record<string, Uint8Array> = {};
    for (let i = 0; i < 40 * SCALE; i++) parts[`xl/media/pad${i}.bin`] = new Uint8Array(256 * 1024);
    const bytes = workbook(sheetOf(2, 2), parts, 6);
    const e = await rejected(readXlsx(bytes, { file: 'many.xlsx' }));
    expect(e.code).toBe('xlsx-expands-too-far');
    expect(e.message).toMatch(/file many\.xlsx: its \d+ parts expand \d+ times together .* more than the limit of 250 times/);
  }, 60_000);

  it('a sheet that never closes its element is an error, not a hang', async () => {
    const e = await rejected(readXlsx(workbook('<worksheet><sheetData><row r="1"><c><v>1', {}, 0), { file: 'cut.xlsx' }));
    expect(e.code).toBe('bad-xlsx');
    expect(e.message).toMatch(/file cut\.xlsx could not be opened as an XLSX workbook: sheet 'Data': the XML of a part ends in the middle of an element/);
  });

  it('JSON nested 200,000 deep is refused by its depth before it is parsed', async () => {
    const depth = 200_000 * SCALE;
    const e = thrown(() => checkJsonDepth('['.repeat(depth) + ']'.repeat(depth), 'deep.json'));
    expect(e.code).toBe('json-too-deep');
    expect(e.message).toMatch(/file deep\.json, line 1: the JSON nests arrays and objects more than 64 deep/);
    const dir = tempDir();
    const file = join(dir, 'deep.json');
    writeFileSync(file, `{"format":"ripplewise-scenarios","version":1,"scenarios":${'['.repeat(depth)}${']'.repeat(depth)}}`);
    const r = await run(['impact', 'data-demo/vellan-coast.csv', '--scenario', file]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/nests arrays and objects more than 64 deep/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it('scenarios × sectors over the limit are refused with the limit and the option named', async () => {
    const dir = tempDir();
    const file = join(dir, 'many.json');
    const count = 40 * SCALE;
    const scenarios = Array.from({ length: count }, (_, i) => ({ name: `s${i}`, changes: [{ sector: 'FISH', amount: 1 }] }));
    writeFileSync(file, JSON.stringify({ format: 'ripplewise-scenarios', version: 1, scenarios }));
    const r = await run(['impact', 'data-demo/vellan-coast.csv', '--scenario', file], { env: { RIPPLEWISE_LIMITS: 'maxScenarioCells=100' } });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(new RegExp(`${count} scenarios on a table of 16 sectors are ${(count * 16).toLocaleString('en')} scenario-sector results, over the limit of 100`));
    expect(r.stderr).toMatch(/RIPPLEWISE_LIMITS=maxScenarioCells=N/);
  });

  it('limits are raised by name, and a wrong name is an error naming the limits', () => {
    expect(parseLimits('maxSectors=20000, maxCells=2e8')).toEqual({ maxSectors: 20000, maxCells: 2e8 });
    expect(() => parseLimits('maxSector=5')).toThrow(/'maxSector=5' is not a limit; the limits are maxBytes, maxCells/);
    expect(() => parseLimits('maxCells=-1')).toThrow(/must be a positive number/);
  });
});

describe('files are never lost', () => {
  const table = () => {
    const dir = tempDir();
    const file = join(dir, 't.json');
    writeFileSync(file, JSON.stringify(TWO_SECTORS));
    return { dir, file };
  };

  it('an output that is the input is refused, through any name, and the input is kept', async () => {
    const { dir, file } = table();
    const before = readFileSync(file);
    for (const out of [file, join(dir, '.', 't.json'), 't.json']) {
      const r = await run(['coefficients', file, '--out', out], { cwd: dir });
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/is the table file .* this command reads; writing it would replace the input/);
    }
    expect(readFileSync(file)).toEqual(before);
  });

  it('the same output given twice is refused before any work', async () => {
    const { dir, file } = table();
    const r = await run(['coefficients', file, '--out', join(dir, 'a.csv'), '--out', join(dir, 'x', '..', 'a.csv')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/the output file .*a\.csv' is given twice/);
    expect(existsSync(join(dir, 'a.csv'))).toBe(false);
  });

  it('with several outputs, a later failure replaces none of the earlier ones and leaves no temporary file', async () => {
    const { dir, file } = table();
    const first = join(dir, 'first.csv');
    writeFileSync(first, 'old contents\n');
    mkdirSync(join(dir, 'blocker'));
    writeFileSync(join(dir, 'blocker', 'not-a-folder'), 'x');
    const r = await run(['coefficients', file, '--out', first, '--out', join(dir, 'blocker', 'not-a-folder', 'second.csv')]);
    expect(r.code).toBe(2);
    expect(readFileSync(first, 'utf8')).toBe('old contents\n');
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
    // And when every output can be written, each is replaced whole.
    const ok = await run(['coefficients', file, '--out', first, '--out', join(dir, 'second.json')]);
    expect(ok.code).toBe(0);
    expect(readFileSync(first, 'utf8')).toMatch(/^code|S1/m);
    expect(JSON.parse(readFileSync(join(dir, 'second.json'), 'utf8'))).toBeTruthy();
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });
});

describe('results are finite or flagged', () => {
  it('amounts near 1e308 are an error finding naming the sector and the measure (exit 1)', async () => {
    const t = structuredClone(TWO_SECTORS);
    t.Z[0]![1] = 1.7e308;
    t.satellites![0]!.values[1] = 1e300;
    const found = rangeFindings(makeTable({ ...t, x: [1000, 2000] }));
    expect(found.map((f) => f.message)).toEqual([
      expect.stringMatching(/^sector 'S1' \(Agriculture\), output .*reach 1\.70e\+308, beyond 1e\+250/),
      expect.stringMatching(/^sector 'S2' \(Manufacturing\), inputs/),
      expect.stringMatching(/^sector 'S2' \(Manufacturing\), Employment \(jobs\)/),
    ]);
    const dir = tempDir();
    const file = join(dir, 'huge.json');
    writeFileSync(file, JSON.stringify({ ...t, x: [1000, 2000] }));
    const r = await run(['multipliers', file]);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/beyond-range: sector 'S1'/);
  });

  it('an infinity in a result is found with its measure, sector and field', () => {
    const found = findInfinite({ measures: [{ code: 'output', unit: 'EUR', sectors: [{ code: 'A', total: 1 }, { code: 'B', total: Infinity }] }] });
    expect(found).toEqual([{ path: 'measures[0].sectors[1].total', field: 'total', value: Infinity, measure: 'output', sector: 'B' }]);
  });
});

describe('no fatal ends', () => {
  it('a fault inside the program says internal error with a short id, never a stack', () => {
    const e = new TypeError("Cannot read properties of undefined (reading 'x')");
    const r = errorReport(e);
    expect(r.code).toBe('internal');
    expect(r.message).toMatch(/^internal error [0-9a-f]{8}: Cannot read properties/);
    expect(r.message).toContain(faultId(e));
    expect(JSON.stringify(r)).not.toMatch(/\n\s+at /);
    expect(r.exitCode).toBe(2);
  });

  it('memory exhausted building a result is a size error (exit 2)', () => {
    const r = errorReport(new RangeError('Invalid string length'));
    expect(r.code).toBe('too-large-result');
    expect(r.exitCode).toBe(2);
  });
});

describe('safe terminal text', () => {
  it('control characters, escape sequences and bidi controls from the data are shown escaped', () => {
    expect(terminalSafe('A\u001b[31mred\u001b[0m \u202eevil\u202c \u009b2J\r')).toBe('A\\x1b[31mred\\x1b[0m \\u202eevil\\u202c \\x9b2J\\x0d');
  });

  it("colours come from the program only, on a terminal; data colours never", async () => {
    const dir = tempDir();
    const t = structuredClone(TWO_SECTORS);
    t.sectors.labels = ['Agri\u001b[31mculture', 'Manu\u2067facturing'];
    const file = join(dir, 'c.json');
    writeFileSync(file, JSON.stringify(t));
    const tty = await run(['multipliers', file], { stdoutTTY: true });
    expect(tty.code).toBe(0);
    expect(tty.stdout).toContain('Agri\\x1b[31mculture');
    expect(tty.stdout).toContain('Manu\\u2067facturing');
    expect(tty.stdout).not.toMatch(/\u001b\[31mculture|\u2067|\ue000/);
    const pipe = await run(['multipliers', file]);
    expect(pipe.stdout).toContain('Agri\\x1b[31mculture');
    expect(pipe.stdout).not.toMatch(/\u001b/);
  });
});
