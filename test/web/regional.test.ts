/**
 * The workbench's regional operations in Node, with the worker's handlers called in-process:
 * `regional-values` + `regionalise` against the command line's `ripplewise regionalise --json`
 * on the same files, FLQ's λ by hand, `balance` against a plain RAS written here, infeasible
 * totals named, and the report carrying both sections.
 *
 * The national table is the ABS 5246.0 worked example (7 industries, Australia 1989-90, read in
 * place from ../shared/reference). The nation's employment is the paper's Table 3; the region's
 * is INVENTED by a stated rule: sector k (0-based, in the paper's order) has round(nation × 0.02 ×
 * (k + 1)) persons, i.e. 2 % of agriculture's up to 14 % of public administration's.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { toPlain } from '../../engine/index';
import type { PlainTable, Table } from '../../engine/index';
import { readTableFile, writeTableJson } from '../../src/io/index';
import { handlers } from '../../web/worker/handlers';
import { makeContext } from '../../web/worker/context';
import type { BalanceView, RegionalView, ValuesFile } from '../../web/worker/ops/regional';
import { REFERENCE_DIR } from '../helpers/reference';
import { run, tempDir } from '../cli/harness';

const DIR = join(REFERENCE_DIR, 'abs-5246-worked-example');
const WHERE = 'published by the Australian Bureau of Statistics (abs.gov.au, Cat. No. 5246.0, 1995); set RIPPLEWISE_REFERENCE to a folder holding abs-5246-worked-example/';
const present = existsSync(join(DIR, 'flows-1989-90.csv'));
if (!present) {
  if (process.env.CI === 'true') throw new Error(`reference data missing under CI: ${DIR} (${WHERE})`);
  console.warn(`skipping the workbench regional tests: ${DIR} not found; the data is ${WHERE}`);
}

async function call<T>(op: string, args: unknown = {}): Promise<T> {
  const ctx = makeContext(() => {}, () => false, []);
  return (await handlers[op]!(args, ctx)) as T;
}

/** The regional file of the rule above: code, Region (persons), Nation (persons). */
export function regionalCsv(nation: { code: string; persons: number }[]): string {
  return ['code,Region (persons),Nation (persons)', ...nation.map((s, k) => `${s.code},${Math.round(s.persons * 0.02 * (k + 1))},${s.persons}`)].join('\n') + '\n';
}

/** A plain RAS (Miller & Blair 2009, ch. 7, from memory): rows then columns until the sums meet the targets. */
function plainRas(A: number[][], u: number[], v: number[]): number[][] {
  let X = A.map((r) => [...r]);
  for (let it = 0; it < 10000; it++) {
    X = X.map((r, i) => {
      const s = r.reduce((a, b) => a + b, 0);
      return r.map((x) => (s > 0 ? (x * u[i]!) / s : x));
    });
    const cs = v.map((_, j) => X.reduce((a, r) => a + r[j]!, 0));
    X = X.map((r) => r.map((x, j) => (cs[j]! > 0 ? (x * v[j]!) / cs[j]! : x)));
    const dev = Math.max(...X.map((r, i) => Math.abs(r.reduce((a, b) => a + b, 0) - u[i]!) / u[i]!));
    if (dev < 1e-13) break;
  }
  return X;
}

describe.skipIf(!present)('the Regionalise step and the Balance tool (worker operations)', () => {
  let dir: string;
  let tablePath: string;
  let regionalPath: string;
  let table: Table;
  let nation: { code: string; persons: number }[];

  beforeAll(async () => {
    dir = tempDir();
    table = (await readTableFile(new Uint8Array(readFileSync(join(DIR, 'flows-1989-90.csv'))), { file: 'flows-1989-90.csv' })).table;
    tablePath = join(dir, 'abs.table.json');
    writeFileSync(tablePath, writeTableJson(table));
    nation = readFileSync(join(DIR, 'employment-1989-90.csv'), 'utf8')
      .trim()
      .split('\n')
      .slice(1)
      .map((l) => l.split(','))
      .map(([code, p]) => ({ code: code!, persons: Number(p) }));
    regionalPath = join(dir, 'region.csv');
    writeFileSync(regionalPath, regionalCsv(nation));
    await call('set-table', { table: toPlain(table) });
  });

  it('regionalises by FLQ as the command line does: the same quotients and multipliers, λ by hand, the file’s SHA-256', async () => {
    const bytes = readFileSync(regionalPath);
    const file = await call<ValuesFile>('regional-values', { name: 'region.csv', bytes: bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.length), axis: 'sectors' });
    expect(file.columns.map((c) => c.name)).toEqual(['Region (persons)', 'Nation (persons)']);
    const view = await call<RegionalView>('regionalise', { columns: file.columns, file: { name: 'region.csv', sha256: file.sha256 }, method: 'flq', delta: 0.3, kind: 'employment' });
    const cli = await run(['regionalise', tablePath, '--regional', regionalPath, '--method', 'flq', '--json']);
    expect(cli.code).toBe(0);
    const j = JSON.parse(cli.stdout);
    expect(file.sha256).toBe(j.provenance.sha256);
    view.codes.forEach((code, i) => {
      expect(j.sectors[i].code).toBe(code);
      expect(view.regional[i]).toBeCloseTo(j.sectors[i].outputMultiplier.regional, 12);
      expect(view.national[i]).toBeCloseTo(j.sectors[i].outputMultiplier.national, 12);
      expect(view.slq[i]).toBeCloseTo(j.sectors[i].slq, 12);
      expect(view.regional[i]).toBeLessThanOrEqual(view.national[i]! + 1e-12);
    });
    // λ = [log2(1 + eR/eN)]^δ (Flegg, Webber & Elliott 1995), by hand from the files' totals.
    const eR = nation.reduce((a, s, k) => a + Math.round(s.persons * 0.02 * (k + 1)), 0);
    const eN = nation.reduce((a, s) => a + s.persons, 0);
    expect(view.lambda).toBeCloseTo(Math.log2(1 + eR / eN) ** 0.3, 12);
    expect(view.cautions.join(' ')).toMatch(/overstate regional multipliers/);
    expect(view.cautions.join(' ')).toMatch(/survey-based or hybrid/);
    expect(view.table.sectors.codes).toEqual(table.sectors.codes);
  });

  it('splits each sector into intraregional, feedback and spillover as `regionalise --two-region` does; the parts add up to the national multiplier', async () => {
    const bytes = readFileSync(regionalPath);
    const file = await call<ValuesFile>('regional-values', { name: 'region.csv', bytes: bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.length) });
    const view = await call<RegionalView>('regionalise', { columns: file.columns, method: 'cilq', kind: 'employment', twoRegion: true });
    const j = JSON.parse((await run(['regionalise', tablePath, '--regional', regionalPath, '--method', 'cilq', '--two-region', '--json'])).stdout);
    view.twoRegion!.forEach((t, i) => {
      expect(t.intraregional).toBeCloseTo(j.sectors[i].twoRegion.intraregional, 12);
      expect(t.spillover).toBeCloseTo(j.sectors[i].twoRegion.spillover, 12);
      // The two-region model's whole-nation output equals the national model's (Miller & Blair 2009, ch. 3).
      expect(t.nation).toBeCloseTo(view.national[i]!, 9);
    });
  });

  it('reads a typed column the same as the file’s region column when the nation’s is given beside it', async () => {
    const region = nation.map((s, k) => Math.round(s.persons * 0.02 * (k + 1)));
    const typed = await call<RegionalView>('regionalise', { columns: [{ name: 'Region (typed)', values: region }, { name: 'Nation (typed)', values: nation.map((s) => s.persons) }], method: 'slq', kind: 'employment' });
    const cli = JSON.parse((await run(['regionalise', tablePath, '--regional', regionalPath, '--method', 'slq', '--json'])).stdout);
    typed.regional.forEach((v, i) => expect(v).toBeCloseTo(cli.sectors[i].outputMultiplier.regional, 12));
    await expect(call('regionalise', { columns: [{ name: 'Region', values: region.slice(1) }], method: 'slq', kind: 'employment' })).rejects.toThrow(/6 values for 7 sectors/);
  });

  it('balances the intermediate flows to new totals as a plain RAS does, within 1e-10', async () => {
    const plain = toPlain(table) as PlainTable;
    const Z = plain.Z;
    const rs = Z.map((r) => r.reduce((a, b) => a + b, 0));
    const cs = Z[0]!.map((_, j) => Z.reduce((a, r) => a + r[j]!, 0));
    // New totals (a stated rule): rows grow by 1 % per row index; columns share the new total as before.
    const u = rs.map((s, i) => s * (1 + 0.01 * i));
    const scale = u.reduce((a, b) => a + b, 0) / cs.reduce((a, b) => a + b, 0);
    const v = cs.map((s) => s * scale);
    const b = await call<BalanceView>('balance', { part: 'intermediate', rowTotals: u, columnTotals: v });
    expect(b.method).toBe('ras');
    expect(b.converged).toBe(true);
    expect(b.maxDeviation).toBeLessThanOrEqual(1e-10);
    b.rowSums.forEach((s, i) => expect(Math.abs(s - u[i]!) / u[i]!).toBeLessThanOrEqual(1e-10));
    b.colSums.forEach((s, j) => expect(Math.abs(s - v[j]!) / v[j]!).toBeLessThanOrEqual(1e-10));
    const ref = plainRas(Z, u, v);
    const n = Z.length;
    // Both stop once the sums are within their tolerance: the cells agree to about that, relatively.
    ref.forEach((r, i) => r.forEach((x, j) => expect(Math.abs(b.X[i * n + j]! - x)).toBeLessThanOrEqual(1e-9 * Math.max(Math.abs(x), 1))));
    expect(b.table!.Z[0]![0]!).toBe(b.X[0]);
  });

  it('names the targets that cannot be met', async () => {
    const n = table.sectors.codes.length;
    const u = new Array(n).fill(100);
    const v = new Array(n).fill(120);
    const b = await call<BalanceView>('balance', { part: 'intermediate', rowTotals: u, columnTotals: v });
    expect(b.converged).toBe(false);
    expect(b.infeasible.some((f) => f.kind === 'totals-disagree')).toBe(true);
    expect(b.table).toBeUndefined();
    await expect(call('balance', { part: 'intermediate', rowTotals: u, columnTotals: u, fixed: [{ row: 'XYZ', col: 'AGR' }] })).rejects.toThrow(/row 'XYZ'/);
  });

  it('the report carries the regional and balance sections, the regional file among the inputs', async () => {
    const bytes = readFileSync(regionalPath);
    const file = await call<ValuesFile>('regional-values', { name: 'region.csv', bytes: bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.length) });
    const Z = (toPlain(table) as PlainTable).Z;
    const rs = Z.map((r) => r.reduce((a, b) => a + b, 0));
    const cs = Z[0]!.map((_, j) => Z.reduce((a, r) => a + r[j]!, 0));
    const r = await call<{ files: { format: string; data: string }[] }>('report-export', {
      source: [{ name: 'abs.table.json', sha256: '0'.repeat(64) }],
      household: 'none',
      tornado: false,
      formats: ['json'],
      regional: { columns: file.columns, file: { name: 'region.csv', sha256: file.sha256 }, method: 'flq', kind: 'employment', region: 'Invented region' },
      balance: { part: 'intermediate', rowTotals: rs, columnTotals: cs },
    });
    const rep = JSON.parse(r.files[0]!.data);
    const ids = rep.sections.map((s: { id: string }) => s.id);
    expect(ids).toContain('regional');
    expect(ids).toContain('balance');
    expect(rep.inputs.some((f: { role: string; sha256: string }) => f.role === 'regional' && f.sha256 === file.sha256)).toBe(true);
    expect(JSON.stringify(rep.cautions)).toMatch(/overstate regional multipliers/);
  });
});
