/**
 * A large CSV table is read as a stream: the command never holds the file whole, and the byte
 * scanner gets the file in chunks from a file stream. The chunked path must give what the
 * whole-file path gives (src/io's readTableFile over the file's bytes, which reads a CSV above
 * 2 MiB through the same scanner), wherever the chunks happen to end: inside a quoted field,
 * between the CR and the LF of a line end, and inside a multi-byte UTF-8 character, before and
 * after the first 64 KiB that settle the encoding and the delimiter. The hash the report states
 * is checked against node:crypto's SHA-256 of the whole file. The table is made with the
 * project's own CSV writer (invented numbers: this checks the reading, not the economics).
 */
import { createHash } from 'node:crypto';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { makeTable } from '../../engine/table';
import { processContext } from '../../src/cli/context';
import { reportInput } from '../../src/cli/files';
import { loadTable } from '../../src/cli/table-input';
import { SCANNER_THRESHOLD } from '../../src/io/csv';
import { readTableCsvStream, readTableFile, writeTableCsv } from '../../src/io/index';
import { run, tempDir } from '../cli/harness';

const SCALE = Number(process.env.FUZZ_SCALE ?? 1);

/** A wide table of n sectors with labels that need quotes (commas, doubled quotes) and multi-byte characters, CRLF line ends. */
function bigCsv(n: number): Uint8Array {
  const codes = Array.from({ length: n }, (_, i) => `S${i + 1}`);
  const labels = codes.map((_, i) => (i % 3 === 0 ? `Fish, "fresh" and frozen € ${i}` : i % 3 === 1 ? `Café – ${i}, Ærø` : `製造 ${i}`));
  const Z = codes.map((_, i) => codes.map((_, j) => ((i * 7919 + j * 104729) % 100000) / 1000));
  const table = makeTable({
    sectors: { codes, labels },
    Z,
    finalDemand: { codes: ['HH', 'EXP'], labels: ['Household consumption', 'Exports, "all"'], values: codes.map((_, i) => [100 + i, 50.25 + i]) },
    valueAdded: { codes: ['COE', 'GOS'], labels: ['Compensation of employees', 'Gross operating surplus'], values: [codes.map((_, j) => 2000 + j), codes.map((_, j) => 1500.5 + j)] },
    meta: { title: 'Invented wide table for the streaming reader', currency: 'EUR' },
  });
  return new TextEncoder().encode(writeTableCsv(table).replace(/\r?\n/g, '\r\n'));
}

/** Offsets in `b` of the first few places after `from` where a chunk boundary is awkward. */
function awkward(b: Uint8Array, from: number): number[] {
  const at: number[] = [];
  let inQuote = false;
  let quoted = -1;
  let crlf = -1;
  let multi = -1;
  for (let i = from; i < b.length && (quoted < 0 || crlf < 0 || multi < 0); i++) {
    if (b[i] === 0x22) inQuote = !inQuote;
    else if (inQuote && quoted < 0 && b[i] !== 0x22) quoted = i;
    if (b[i] === 0x0d && b[i + 1] === 0x0a && crlf < 0) crlf = i + 1;
    if (b[i]! >= 0xc0 && multi < 0) multi = i + 1;
  }
  at.push(quoted, crlf, multi);
  return at;
}

async function* pieces(b: Uint8Array, cuts: number[]): AsyncIterable<Uint8Array> {
  let s = 0;
  for (const c of [...new Set(cuts)].filter((c) => c > 0 && c < b.length).sort((x, y) => x - y)) {
    yield b.subarray(s, c);
    s = c;
  }
  yield b.subarray(s);
}

const n = Math.round(600 * Math.sqrt(SCALE));
const bytes = bigCsv(n);

describe('a large CSV read as a stream', () => {
  it('is above the scanner threshold, with quoted fields, CRLF and multi-byte characters at the chosen cuts', () => {
    expect(bytes.length).toBeGreaterThan(SCANNER_THRESHOLD);
    const cuts = [...awkward(bytes, 100), ...awkward(bytes, 70_000), ...awkward(bytes, bytes.length - 20_000)];
    expect(cuts.every((c) => c > 0)).toBe(true);
    // Each cut is where the scanner must carry state over: inside quotes, between CR and LF, in a character.
    const [q, crlf, multi] = cuts;
    expect(bytes[crlf! - 1]).toBe(0x0d);
    expect(bytes[crlf!]).toBe(0x0a);
    expect(bytes[multi!]! & 0xc0).toBe(0x80);
    expect(new TextDecoder().decode(bytes.subarray(bytes.lastIndexOf(0x0a, q!) + 1, q!)).split('"').length % 2).toBe(0);
  });

  it('gives the table, findings and layout of the whole-file read, wherever the chunks end', async () => {
    const whole = await readTableFile(bytes, { file: 'big.csv' });
    const cuts = [...awkward(bytes, 100), ...awkward(bytes, 70_000), ...awkward(bytes, bytes.length - 20_000)];
    const chunked = await readTableCsvStream(pieces(bytes, cuts), { file: 'big.csv' });
    expect(chunked.table.sectors.labels[0]).toBe('Fish, "fresh" and frozen € 0');
    expect(chunked.table.sectors.labels[2]).toBe('製造 2');
    expect(chunked).toEqual(whole);
    // One byte at a time across a boundary region, and random cuts.
    const bytewise = Array.from({ length: 200 }, (_, i) => 65_500 + i);
    expect(await readTableCsvStream(pieces(bytes, bytewise), { file: 'big.csv' })).toEqual(whole);
    await fc.assert(
      fc.asyncProperty(fc.array(fc.integer({ min: 1, max: bytes.length - 1 }), { minLength: 1, maxLength: 40 }), async (cutsAt) => {
        const r = await readTableCsvStream(pieces(bytes, cutsAt), { file: 'big.csv' });
        expect(r.table).toEqual(whole.table);
        expect(r.findings).toEqual(whole.findings);
      }),
      { numRuns: 4 },
    );
  }, 120_000);

  it('takes the encoding from the first 64 KiB, whole or in chunks: a later byte that is not UTF-8 is an error naming its cell', async () => {
    // 'é' in Windows-1252 (0xE9) in a label near the end, where the first 64 KiB are UTF-8.
    const at = bytes.lastIndexOf(0x43, bytes.length - 5000); // a 'C' of 'Café' in a late row
    expect(at).toBeGreaterThan(65536);
    const bad = bytes.slice();
    bad.set([0x43, 0x61, 0x66, 0xe9], at);
    const whole = await readTableFile(bad, { file: 'late.csv' }).then(() => undefined, (e: Error) => e.message);
    const chunked = await readTableCsvStream(pieces(bad, [70_000, at + 2]), { file: 'late.csv' }).then(() => undefined, (e: Error) => e.message);
    expect(whole).toMatch(/^file late\.csv, cell [A-Z]+\d+: the bytes are not valid UTF-8/);
    expect(chunked).toBe(whole);
  }, 60_000);

  it('the command streams it from disk: the same table as the whole read, the SHA-256 and size of the whole file', async () => {
    const dir = tempDir();
    const path = join(dir, 'big.csv');
    writeFileSync(path, bytes);
    const loaded = await loadTable(processContext(), path, {});
    const whole = await readTableFile(bytes, { file: path });
    expect(loaded.table).toEqual(whole.table);
    expect(loaded.findings).toEqual(whole.findings);
    // Streamed: the command kept only the file's first bytes.
    expect(loaded.file.bytes.length).toBeLessThan(100_000);
    expect(loaded.file.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
    expect(reportInput(loaded.file, 'table').bytes).toBe(bytes.length);
    // Through the whole command: the same result from the file and from standard input (both
    // streamed), the same as a small table read whole gives back, and the hash in its JSON.
    const fromFile = await run(['convert', path, '--format', 'csv']);
    const fromStdin = await run(['convert', '-', '--input-format', 'csv', '--format', 'csv'], { stdin: bytes });
    expect(fromFile.code).toBe(0);
    expect(fromFile.stdout).toBe(fromStdin.stdout);
    const sha = createHash('sha256').update(bytes).digest('hex');
    for (const args of [[path], ['-']]) {
      const checked = await run(['check', ...args, '--json'], { stdin: bytes });
      expect(JSON.parse(checked.stdout).sha256).toBe(sha);
    }
  }, 120_000);
});
