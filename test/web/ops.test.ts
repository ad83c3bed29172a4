/**
 * The workbench's analysis operations as the worker runs them (called here in Node with the
 * worker's own context), checked against independent plain computations with ml-matrix
 * (source: ml-matrix 6.15.1, a general-purpose linear-algebra library that shares no code with
 * the engine) and against a published table (source: U.S. Bureau of Economic Analysis, Benchmark
 * Input-Output Accounts of the United States, 1997, Table 8, read in place).
 */
import { describe, expect, it } from 'vitest';
import { inverse as mlInverse, Matrix as MlMatrix } from 'ml-matrix';
import { CancelledError, coefficients, monteCarlo, toPlain } from '../../engine/index';
import type { PlainTable, Table } from '../../engine/index';
import { handlers } from '../../web/worker/handlers';
import { makeContext } from '../../web/worker/context';
import type { ImpactsResult, MultipliersResult, ScenarioCheck } from '../../web/worker/ops/analyses';
import type { MonteCarloView, SensitivityResult, WhatIfResult } from '../../web/worker/ops/sensitivity';
import { denseA, denseL, randomTable, relErr, rowTimes, timesCol } from '../engine/analyses/tables';
import { beaAvailable, BEA_SOURCE } from '../helpers/reference';
import { beaEconomy } from '../engine/sensitivity/bea';

interface Call {
  value: unknown;
  transfers: ArrayBuffer[];
  progress: number[];
}

/** Run one operation with the worker's context; `cancelAfter` cancels once that many checkpoints have passed. */
async function call(op: string, args: unknown = {}, cancelAfter?: number): Promise<Call> {
  const transfers: ArrayBuffer[] = [];
  const progress: number[] = [];
  let checks = 0;
  const ctx = makeContext((p) => progress.push(p.fraction), () => cancelAfter !== undefined && checks >= cancelAfter, transfers);
  const inner = ctx.checkpoint.bind(ctx);
  ctx.checkpoint = async () => {
    checks++;
    await inner();
  };
  const value = await handlers[op]!(args, ctx);
  return { value, transfers, progress };
}

async function open(t: Table | PlainTable): Promise<void> {
  await call('set-table', { table: 'Z' in t && !Array.isArray((t as PlainTable).Z) ? toPlain(t as Table) : t });
}

/** The closed model as a bordered (n + 1) × (n + 1) matrix, inverted densely (common practice). */
function closedInverse(t: Table): MlMatrix {
  const n = t.x.length;
  const A = denseA(t);
  const hh = t.finalDemand.codes.indexOf('HH');
  const coe = t.valueAdded.codes.indexOf('COE');
  let income = 0;
  for (let j = 0; j < n; j++) income += t.V.data[coe * n + j]!;
  const B = new MlMatrix(n + 1, n + 1);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) B.set(i, j, A.get(i, j));
  for (let i = 0; i < n; i++) B.set(i, n, t.F.data[i * t.F.cols + hh]! / income);
  for (let j = 0; j < n; j++) B.set(n, j, t.V.data[coe * n + j]! / t.x[j]!);
  return mlInverse(MlMatrix.eye(n + 1).sub(B));
}

describe('worker operations: multipliers, linkages, scenarios and impacts', () => {
  const t = randomTable({ n: 12, seed: 21 });
  const n = 12;

  it('multipliers of every measure match c′L and the closed model inverted densely (source: ml-matrix 6.15.1)', async () => {
    await open(t);
    const { value, transfers } = await call('multipliers', { household: { income: ['COE'], consumption: 'HH' } });
    const r = value as MultipliersResult;
    expect(r.household.used).toBe(true);
    expect(r.measures.map((m) => m.measure.code)).toEqual(['output', 'value-added', 'labour-income', 'JOBS', 'GHG']);
    const L = denseL(denseA(t));
    const Lbar = closedInverse(t).subMatrix(0, n - 1, 0, n - 1);
    for (const m of r.measures) {
      const c = m.direct;
      expect(relErr(m.simple, rowTimes(c, L))).toBeLessThan(1e-10);
      expect(relErr(m.total!, rowTimes(c, Lbar))).toBeLessThan(1e-10);
      for (let j = 0; j < n; j++) {
        if (c[j] === 0) expect(Number.isNaN(m.typeI[j]!)).toBe(true);
        else expect(m.typeII![j]!).toBeCloseTo(m.total![j]! / c[j]!, 10);
      }
    }
    expect(r.measures[0]!.unit).toBe('USD millions per USD millions of final demand');
    expect(r.measures[3]!.unit).toBe('FTE jobs per USD millions of final demand');
    // Every typed array travels by transfer, each buffer once.
    expect(new Set(transfers).size).toBe(transfers.length);
    // direct, indirect, simple, induced, total, Type I and Type II of each measure.
    expect(transfers.length).toBe(r.measures.length * 7);
  });

  it('a closure that cannot be used leaves the open model and says why; none gives no Type II', async () => {
    const bad = (await call('multipliers', { household: { income: ['NOPE'], consumption: 'HH' } })).value as MultipliersResult;
    expect(bad.household.used).toBe(false);
    expect(bad.household.problem).toMatch(/cannot be used.*'NOPE'/);
    expect(bad.measures[0]!.total).toBeUndefined();
    const none = (await call('multipliers', { household: 'none' })).value as MultipliersResult;
    expect(none.household.used).toBe(false);
    expect(none.household.problem).toBeUndefined();
    expect(none.measures[0]!.typeII).toBeUndefined();
  });

  it('transferring a result never empties what the session keeps (common practice: transfer only fresh buffers)', async () => {
    const first = await call('multipliers', { household: 'guess' });
    // Detach every buffer, as postMessage with a transfer list does.
    structuredClone(first.value, { transfer: first.transfers });
    const again = (await call('multipliers', { household: 'guess' })).value as MultipliersResult;
    expect(again.measures[0]!.simple.length).toBe(n);
    const lk1 = await call('linkages');
    structuredClone(lk1.value, { transfer: lk1.transfers });
    const lk2 = (await call('linkages')).value as { power: Float64Array };
    expect(lk2.power.length).toBe(n);
    const L = denseL(denseA(t));
    const cs = L.transpose().mmul(MlMatrix.columnVector(new Array(n).fill(1))).getColumn(0);
    const mean = cs.reduce((a, b) => a + b, 0) / n;
    expect(relErr(lk2.power, cs.map((v) => v / mean))).toBeLessThan(1e-10);
  });

  it('checks a scenario: every problem, each row its own without the position, and the resolved amounts', async () => {
    const r = (
      await call('check-scenario', {
        scenario: { name: 'Try', changes: [{ sector: 'S01', amount: 5 }, { sector: 'S99', amount: 1 }, { sector: 'S03', amount: 2, percent: 4 }, { sector: 'S04', percent: 10, localShare: 1.5 }] },
      })
    ).value as ScenarioCheck;
    expect(r.findings.map((f) => f.code)).toEqual(['unknown-sector', 'amount-or-percent', 'bad-local-share']);
    expect(r.findings[0]!.message).toMatch(/^change 2 of scenario 'Try': there is no sector 'S99'/);
    expect(r.rows.map((x) => x.map((f) => f.code))).toEqual([[], ['unknown-sector'], ['amount-or-percent'], ['bad-local-share']]);
    expect(r.rows[1]![0]!.message).toMatch(/^there is no sector 'S99'/);
    expect(r.resolved).toBeNull();
    const ok = (await call('check-scenario', { scenario: { name: 'Fine', changes: [{ sector: 'S01', amount: 5, localShare: 0.6 }] } })).value as ScenarioCheck;
    expect(ok.findings).toEqual([]);
    expect(ok.resolved!.totalGross).toBe(5);
    expect(ok.resolved!.totalLocal).toBeCloseTo(3, 12);
  });

  it('impacts of several scenarios split into parts and compared with a base (source: ml-matrix 6.15.1)', async () => {
    const scenarios = [
      { name: 'A', changes: [{ sector: 'S02', amount: 10 }] },
      { name: 'B', changes: [{ sector: 'S05', amount: 4, localShare: 0.5 }, { sector: 'S07', amount: -3 }] },
      { name: 'Broken', changes: [{ sector: 'NOPE', amount: 1 }] },
    ];
    const r = (await call('impacts', { scenarios, household: { income: ['COE'], consumption: 'HH' }, base: 'B' })).value as ImpactsResult;
    expect(r.scenarios.map((s) => s.ok)).toEqual([true, true, false]);
    expect(r.scenarios[2]!.findings[0]!.code).toBe('unknown-sector');
    expect(r.impacts.map((x) => x.scenario)).toEqual(['A', 'B']);
    const L = denseL(denseA(t));
    const Lbar = closedInverse(t).subMatrix(0, n - 1, 0, n - 1);
    const d = new Array(n).fill(0);
    d[4] = 2;
    d[6] = -3;
    const open = timesCol(L, d);
    const closed = timesCol(Lbar, d);
    const out = r.impacts[1]!.measures[0]!;
    expect(relErr(out.direct, d)).toBeLessThan(1e-12);
    expect(relErr(out.indirect, open.map((v, i) => v - d[i]))).toBeLessThan(1e-10);
    expect(relErr(out.induced, closed.map((v, i) => v - open[i]!))).toBeLessThan(1e-10);
    expect(out.totals.total).toBeCloseTo(closed.reduce((a, b) => a + b, 0), 9);
    const c = r.comparison!;
    expect(c.base).toBe('B');
    expect(c.baseIndex).toBe(1);
    const tot = c.measures[0]!.totals.total;
    expect(c.measures[0]!.difference.totals.total[0]).toBeCloseTo(tot[0]! - tot[1]!, 10);
    expect(c.measures[0]!.difference.totals.total[1]).toBe(0);
  });
});

describe('worker operations: sensitivity, what-if and Monte Carlo', () => {
  const t = randomTable({ n: 10, seed: 5 });
  const n = 10;

  it('tornado ends equal full recomputes with the coefficient moved (source: ml-matrix 6.15.1)', async () => {
    await open(t);
    const r = (await call('sensitivity', { target: { kind: 'multiplier', sector: 'S03', measure: 'output' }, percent: 20, top: 4 })).value as SensitivityResult;
    const A = denseA(t);
    const base = rowTimes(new Array(n).fill(1), denseL(A))[2]!;
    expect(r.value).toBeCloseTo(base, 10);
    expect(r.tornado.bars.length).toBe(4);
    for (const [k, b] of r.tornado.bars.entries()) {
      const cell = r.tornado.cells[k]!;
      expect(cell.colCode).toBe(t.sectors.codes[b.col]);
      for (const [end, f] of [[b.low, 0.8], [b.high, 1.2]] as const) {
        const A2 = A.clone();
        A2.set(b.row, b.col, A.get(b.row, b.col) * f);
        const v = rowTimes(new Array(n).fill(1), denseL(A2))[2]!;
        expect(end.result).not.toBe('none');
        expect(end.result as number).toBeCloseTo(v, 9);
      }
    }
    expect(r.influential[0]!.elasticity).not.toBeNull();
    expect(r.label).toMatch(/Output multiplier of Sector 3 \(S03\)/);
  });

  it('what-if edits give the multipliers of the edited table; a column summing to 1 is named (source: ml-matrix 6.15.1)', async () => {
    const edits = [
      { row: 'S01', col: 'S04', value: 0.2 },
      { row: 'S06', col: 'S04', value: 0.01 },
      { row: 'S02', col: 'S09', value: 0.15 },
    ];
    const r = (await call('what-if', { edits, measure: 'JOBS' })).value as WhatIfResult;
    const A = denseA(t);
    for (const e of edits) A.set(t.sectors.codes.indexOf(e.row), t.sectors.codes.indexOf(e.col), e.value);
    const L = denseL(A);
    expect(relErr(r.output, rowTimes(new Array(n).fill(1), L))).toBeLessThan(1e-10);
    const c = Array.from({ length: n }, (_, j) => t.satellites[0]!.values[j]! / t.x[j]!);
    expect(relErr(r.measureValues, rowTimes(c, L))).toBeLessThan(1e-10);
    expect(relErr(r.baseOutput, rowTimes(new Array(n).fill(1), denseL(denseA(t))))).toBeLessThan(1e-10);
    expect(r.edits.map((e) => e.before)).toEqual(edits.map((e) => denseA(t).get(t.sectors.codes.indexOf(e.row), t.sectors.codes.indexOf(e.col))));
    expect(r.findings).toEqual([]);
    // The list is applied afresh each time: no edits is the table itself.
    const none = (await call('what-if', { edits: [], measure: 'output' })).value as WhatIfResult;
    expect(relErr(none.output, none.baseOutput)).toBe(0);
    const over = (await call('what-if', { edits: [{ row: 'S01', col: 'S02', value: 1.2 }] })).value as WhatIfResult;
    expect(over.notProductive).toEqual(['S02']);
    expect(over.findings[0]!.code).toBe('edit-not-productive');
    await expect(call('what-if', { edits: [{ row: 'S01', col: 'S02', value: Number.NaN }] })).rejects.toThrow(/not a finite number/);
  });

  it('Monte Carlo in chunks gives the single run of the engine, reports progress, and stops when cancelled', async () => {
    const scen = { name: 'S', changes: [{ sector: 'S02', amount: 10 }] };
    const res = await call('monte-carlo', { cv: 0.15, draws: 300, seed: 9, measure: 'output', scenarios: [scen], focus: { sector: 'S04' }, chunk: 7 });
    const r = res.value as MonteCarloView;
    expect(r.chunks).toBeGreaterThan(1);
    expect(res.progress.at(-1)).toBe(1);
    for (let k = 1; k < res.progress.length; k++) expect(res.progress[k]!).toBeGreaterThanOrEqual(res.progress[k - 1]!);
    // The same draws in one piece, straight from the engine (draws depend only on the seed and index).
    const A = denseA(t);
    const d = new Float64Array(n);
    d[1] = 10;
    const one = monteCarlo({ A: coefficients(t), cv: 0.15, draws: 300, seed: 9, sectors: t.sectors.codes, measures: [{ code: 'output', c: new Float64Array(n).fill(1) }], scenarios: [{ code: 's0', d }] });
    expect(r.accepted).toBe(one.accepted);
    expect(Array.from(r.multipliers.p50)).toEqual(one.multipliers[0]!.bySector.map((s) => s.p50));
    expect(Array.from(r.multipliers.p5)).toEqual(one.multipliers[0]!.bySector.map((s) => s.p5));
    expect(r.scenarios[0]!.total.p95).toBe(one.scenarios[0]!.measures[0]!.total.p95);
    expect(r.focus!.bins.reduce((s, b) => s + b.count, 0)).toBe(r.accepted);
    // The point values are the table's own multipliers.
    expect(relErr(r.multipliers.point, rowTimes(new Array(n).fill(1), denseL(A)))).toBeLessThan(1e-10);
    await expect(call('monte-carlo', { cv: 0.1, draws: 5000, seed: 1, chunk: 5 }, 2)).rejects.toBeInstanceOf(CancelledError);
    await expect(call('monte-carlo', { cv: 0.1, draws: 0, seed: 1 })).rejects.toThrow(/number of draws/);
    await expect(call('monte-carlo', { cv: 10, draws: 10, seed: 1 })).rejects.toThrow(/coefficient of variation/);
    await expect(call('monte-carlo', { cv: 0.1, draws: 10, seed: 1, workers: 0 })).rejects.toThrow(/number of workers must be a whole number from 1 to 16; got 0/);
    await expect(call('monte-carlo', { cv: 0.1, draws: 10, seed: 1, workers: 2.5 })).rejects.toThrow(/number of workers/);
    // Node has no Web Workers: the run stays in this thread and says so.
    expect(((await call('monte-carlo', { cv: 0.1, draws: 10, seed: 1, workers: 2 })).value as MonteCarloView).workers).toBe(1);
  });
});

describe.runIf(beaAvailable())('worker operations on a published table', () => {
  it(`output multipliers equal the column sums of the published total requirements (source: ${BEA_SOURCE}, Table 8)`, async () => {
    const e = beaEconomy();
    const n = e.codes.length;
    const Z: number[][] = [];
    for (let i = 0; i < n; i++) Z.push(Array.from(e.A.data.subarray(i * n, (i + 1) * n)));
    await open({ sectors: { codes: e.codes }, Z, x: new Array(n).fill(1), meta: { currency: 'USD', scaleLabel: 'millions', outputAssumed: true } });
    const r = (await call('multipliers', { household: 'guess' })).value as MultipliersResult;
    expect(r.household.used).toBe(false);
    const simple = r.measures[0]!.simple;
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += e.L.data[i * n + j]!;
      // The table is published to 7 decimals.
      expect(Math.abs(simple[j]! - s)).toBeLessThan(1e-5);
    }
  });
});
