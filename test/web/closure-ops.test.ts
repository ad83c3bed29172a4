/**
 * The workbench's closure choices and rounds in the worker (in Node), and the views' state that
 * carries them, on the Australian Bureau of Statistics worked example (cat. no. 5246.0 (1995),
 * Tables 1 and 5; ../shared/reference/abs-5246-worked-example/): the rounds against the paper's
 * printed first-round and industrial-support figures (4 decimals), each closure basis against
 * the command line's `prepareModels` for the same options, the report's settings and the tidy
 * CSV's rounds lines. Older saved views restore with the same closure as before.
 */
import { describe, expect, it } from 'vitest';
import { makeTable, toPlain } from '../../engine/index';
import { prepareModels } from '../../src/cli/model-options';
import { handlers } from '../../web/worker/handlers';
import { makeContext } from '../../web/worker/context';
import type { ImpactsResult, MultipliersResult } from '../../web/worker/ops/analyses';
import type { ReportFile } from '../../web/worker/ops/report';
import { defaultViews, householdArg, householdBasisOf, restoreViews, snapshotViews, viewState } from '../../web/lib/views.svelte';
import { settingsToViews, viewsToSettings } from '../../web/lib/persist';
import { absAvailable, loadAbs } from '../helpers/abs-worked-example';

async function call<T>(op: string, args: unknown = {}): Promise<T> {
  const ctx = makeContext(() => {}, () => false, []);
  return (await handlers[op]!(args, ctx)) as T;
}

const have = absAvailable();
const PRINTED = 8e-5;

describe.skipIf(!have)('closure bases and rounds in the worker (ABS 5246.0 worked example)', () => {
  const abs = have ? loadAbs() : undefined;

  it('rounds: first round and later rounds are the printed Table 5 figures and add up to the indirect effect', async () => {
    await call('set-table', { table: toPlain(abs!.table) });
    const r = await call<MultipliersResult>('multipliers', { household: 'none', rounds: true });
    const out = r.measures.find((m) => m.measure.code === 'output')!;
    abs!.published.forEach((p, j) => {
      expect(Math.abs(out.firstRound![j]! - p.first), p.code).toBeLessThan(PRINTED);
      expect(Math.abs(out.laterRounds![j]! - p.support), p.code).toBeLessThan(PRINTED);
      expect(out.firstRound![j]! + out.laterRounds![j]!).toBeCloseTo(out.indirect[j]!, 12);
    });
    const plain = await call<MultipliersResult>('multipliers', { household: 'none' });
    expect(plain.measures[0]!.firstRound).toBeUndefined();
    // Impacts: one unit of demand for AGR has the same split.
    const im = await call<ImpactsResult>('impacts', { scenarios: [{ name: 'one', changes: [{ sector: 'AGR', amount: 1 }] }], household: 'none', rounds: true });
    expect(Math.abs(im.impacts[0]!.measures[0]!.totals.firstRound! - abs!.published[0]!.first)).toBeLessThan(PRINTED);
  });

  it('no confident guess: the closure is not used and the page is told why', async () => {
    await call('set-table', { table: toPlain(abs!.table) });
    const r = await call<MultipliersResult>('multipliers', { household: 'guess' });
    expect(r.household.used).toBe(false);
    expect(r.household.problem).toMatch(/No household closure was found/);
  });

  it('every basis gives the command line\'s Type II and share for the same options, with the plausibility warning', async () => {
    await call('set-table', { table: toPlain(abs!.table) });
    const cases: { flags: Record<string, string>; setting: Parameters<typeof householdArg>[0] }[] = [
      { flags: {}, setting: { use: true, income: ['WSS'], consumption: 'FCE', propensity: null, closureBasis: 'labour-income' } },
      { flags: { householdBasis: 'consumption-total' }, setting: { use: true, income: ['WSS'], consumption: 'FCE', propensity: null, closureBasis: 'consumption-total' } },
      { flags: { householdIncome: '285941' }, setting: { use: true, income: ['WSS'], consumption: 'FCE', propensity: 0.3, householdIncome: 285941, closureBasis: 'household-income' } },
      { flags: { propensity: '0.6', householdOwnPurchases: '1000' }, setting: { use: true, income: ['WSS'], consumption: 'FCE', propensity: 0.6, householdIncome: 9, closureBasis: 'propensity', ownPurchases: 1000 } },
    ];
    for (const c of cases) {
      const prep = prepareModels(makeTable(toPlain(abs!.table)), { householdColumn: 'FCE', labourIncomeRow: 'WSS', measure: 'output', ...c.flags });
      const r = await call<MultipliersResult>('multipliers', { household: householdArg(c.setting) });
      expect(r.household.used, JSON.stringify(c.flags)).toBe(true);
      expect(r.household.basis).toBe(prep.models.closure!.basis);
      expect(r.household.share).toBeCloseTo(prep.models.closure!.share, 14);
      expect(r.household.denominator).toBeCloseTo(prep.models.closure!.denominator, 8);
      const cli = prep.models.closed!.extendWeighted(prep.models.open.outputMultipliers()).sectors;
      const out = r.measures.find((m) => m.measure.code === 'output')!;
      for (let j = 0; j < 7; j++) expect(out.total![j]!).toBeCloseTo(cli[j]!, 12);
    }
    // Labour income as the divisor: FCE over the sectors is about 1.48 × wages, which is flagged.
    const lab = await call<MultipliersResult>('multipliers', { household: householdArg(cases[0]!.setting) });
    expect(lab.household.share!).toBeGreaterThan(1);
    expect(lab.household.findings.map((f) => f.code)).toContain('household-share-high');
  });

  it('the report states the basis, the share, the split and the conventions; the tidy CSV has the rounds', async () => {
    await call('set-table', { table: toPlain(abs!.table) });
    const r = await call<{ files: ReportFile[] }>('report-export', {
      source: [{ name: 'abs.json', sha256: 'c'.repeat(64) }],
      scenarios: [{ name: 'Plant', changes: [{ sector: 'MAN', amount: 10 }] }],
      household: { income: ['WSS'], consumption: 'FCE', basis: 'household-income', householdIncome: 285941 },
      rounds: true,
      tornado: false,
      formats: ['json', 'tidy-csv'],
    });
    const json = JSON.parse(r.files[0]!.data as string);
    const s = new Map((json.settings as { key: string; value: unknown; source: string }[]).map((x) => [x.key, x]));
    expect(s.get('householdBasis')).toMatchObject({ value: 'household-income', source: 'given' });
    expect(s.get('householdIncome')?.value).toBe(285941);
    let fce = 0;
    for (let i = 0; i < 7; i++) fce += abs!.table.F.data[i * abs!.table.F.cols]!;
    expect(Number(s.get('spendingShare')?.value)).toBeCloseTo(fce / 285941, 14);
    expect(s.get('split')?.value).toBe('rounds');
    expect((json.assumptions as string[]).join('\n')).toMatch(/Induced = total − simple/);
    const tidy = (r.files[1]!.data as string).split('\n').filter((l) => l.startsWith('Plant,MAN,output,'));
    const val = (e: string) => Number(tidy.find((l) => l.split(',')[3] === e)!.split(',')[4]);
    expect(val('first-round') + val('later-rounds')).toBeCloseTo(val('indirect'), 9);
    // First round of 10 of demand for MAN: 10 × A's MAN column, c ⊙ (A Δd) for output, MAN's own row.
    const man = abs!.table.sectors.codes.indexOf('MAN');
    expect(val('first-round')).toBeCloseTo((10 * abs!.table.Z.data[man * 7 + man]!) / abs!.table.x[man]!, 9);
  });
});

describe('the closure in the views state', () => {
  it('older saved settings restore with the closure they had (the basis inferred as before)', () => {
    restoreViews({ ...defaultViews(), household: { use: true, income: ['COE'], consumption: 'HH', propensity: 0.7, basis: 'labour-income' } });
    expect(householdBasisOf(viewState.household!)).toBe('propensity');
    expect(householdArg()).toEqual({ income: ['COE'], consumption: 'HH', basis: 'propensity', propensity: 0.7 });
    const old = { ...defaultViews() } as Record<string, unknown>;
    delete old.rounds;
    restoreViews({ ...old, household: { use: true, income: ['COE'], consumption: 'HH', propensity: null, householdIncome: 500 } });
    expect(householdArg()).toEqual({ income: ['COE'], consumption: 'HH', householdIncome: 500 });
    expect(viewState.rounds).toBe(false);
    restoreViews({ ...defaultViews(), household: { use: true, income: ['COE'], consumption: 'HH', propensity: null, basis: 'consumption-total' } });
    expect(householdArg()).toEqual({ income: ['COE'], consumption: 'HH', basis: 'consumption-total' });
  });

  it('the four bases, own purchases and the rounds toggle survive a project round trip; bad values are named', () => {
    restoreViews(defaultViews());
    viewState.household = { use: true, income: ['COE'], consumption: 'HH', propensity: 0.4, householdIncome: 900, closureBasis: 'household-income', ownPurchases: 12 };
    viewState.rounds = true;
    const flat = viewsToSettings(snapshotViews());
    restoreViews(defaultViews());
    const { snapshot } = settingsToViews(flat, []);
    expect(restoreViews(snapshot)).toEqual([]);
    expect(viewState.rounds).toBe(true);
    // The share typed before stays in the settings, but only the basis's own figure is used.
    expect(householdArg()).toEqual({ income: ['COE'], consumption: 'HH', basis: 'household-income', householdIncome: 900, ownPurchases: 12 });
    const notes = restoreViews({ ...defaultViews(), rounds: 'yes', household: { use: true, income: ['COE'], consumption: 'HH', propensity: null, closureBasis: 'guess', ownPurchases: -1 } });
    expect(notes.join('\n')).toMatch(/rounds: not true or false/);
    expect(notes.join('\n')).toMatch(/household\.closureBasis: "guess" is not one of/);
    expect(notes.join('\n')).toMatch(/household\.ownPurchases: -1/);
    expect(householdArg()).toEqual({ income: ['COE'], consumption: 'HH' });
  });
});
