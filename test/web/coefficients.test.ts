/**
 * A technical-coefficients sheet opened in the workbench (columns of the intermediate block
 * summing below 1, no output row or column, final demand in levels) is proposed as coefficients
 * at the Layout step, with the reader's reason, and read so: the same table the command line reads
 * (rule coefficients-by-content, src/io/tables.ts), no false balance errors. Invented figures
 * (a layout case; A = Z x̂⁻¹ is the trade's definition of technical coefficients).
 */
import { describe, expect, it } from 'vitest';
import { readTableFile } from '../../src/io/index';
import { handlers } from '../../web/worker/handlers';
import { makeContext } from '../../web/worker/context';
import type { DetectResult, Opened, ReadResult, SheetInfo } from '../../web/worker/ops/files';

async function call<T>(op: string, args: unknown = {}): Promise<T> {
  const ctx = makeContext(() => {}, () => false, []);
  return (await handlers[op]!(args, ctx)) as T;
}

const codes = ['AG', 'MF', 'SV'];
const A = [
  [0.1, 0.05, 0.02],
  [0.2, 0.3, 0.1],
  [0.05, 0.15, 0.2],
];
const f = [
  [50, 20],
  [120, 60],
  [200, 15],
];
const text = [
  'code,sector,AG,MF,SV,Household consumption,Exports',
  ...codes.map((c, i) => [c, `Sector ${c}`, ...A[i]!, ...f[i]!].join(',')),
].join('\n');
const bytes = () => new TextEncoder().encode(text);

describe('coefficients by content in the workbench', () => {
  it('proposes the kind coefficients with the reason, and reads the table the command line reads', async () => {
    const s = (await call<Opened>('file-open', { name: 'coefficients.csv', bytes: bytes() })) as SheetInfo;
    const d = await call<DetectResult>('file-detect', { id: s.id });
    expect(d.problem).toBeUndefined();
    expect(d.mapping!.kind).toBe('coefficients');
    const note = d.findings.find((x) => x.code === 'read-as-coefficients');
    expect(note?.message).toMatch(/every column sums below 1/);
    const r = await call<ReadResult>('file-read', { id: s.id, mapping: d.mapping });
    expect(r.findings.filter((x) => x.severity === 'error')).toEqual([]);
    const direct = await readTableFile(bytes(), { file: 'coefficients.csv' });
    expect(direct.findings.some((x) => x.code === 'read-as-coefficients')).toBe(true);
    expect(r.table.x).toEqual(Array.from(direct.table.x));
    // A = Z x̂⁻¹ gives the coefficients back.
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(r.table.Z[i]![j]! / r.table.x![j]!).toBeCloseTo(A[i]![j]!, 12);
  });

  it('keeps flows when the user chose flows', async () => {
    const s = (await call<Opened>('file-open', { name: 'coefficients.csv', bytes: bytes() })) as SheetInfo;
    const d = await call<DetectResult>('file-detect', { id: s.id, kind: 'flows' });
    expect(d.mapping!.kind).toBe('flows');
    expect(d.findings.some((x) => x.code === 'read-as-coefficients')).toBe(false);
  });
});
