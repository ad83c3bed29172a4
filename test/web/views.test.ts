/**
 * The views' shared state: serialisable, restored field by field with a note for each problem,
 * scenarios kept as drafts that convert to and from the engine's scenarios, and the scenario
 * list's actions. The scenario file checks come from src/project (the project's own format).
 */
import { beforeEach, describe, expect, it } from 'vitest';
import { checkScenario, makeTable } from '../../engine/index';
import type { PlainTable } from '../../engine/index';
import { readScenarios, writeScenarios } from '../../src/project/scenarios';
import {
  addChange,
  addScenario,
  defaultViews,
  deleteScenario,
  demoScenarioList,
  draftOf,
  duplicateScenario,
  householdArg,
  loadScenarios,
  removeChange,
  renameScenario,
  restoreViews,
  scenarioOf,
  scenariosForProject,
  snapshotViews,
  syncViewsToTable,
  uniqueName,
  viewState,
} from '../../web/lib/views.svelte';

const small: PlainTable = {
  sectors: { codes: ['A', 'B', 'C'], labels: ['Farming', 'Making', 'Services'] },
  Z: [
    [10, 20, 5],
    [15, 5, 10],
    [5, 10, 20],
  ],
  finalDemand: { codes: ['HH', 'EXP'], labels: ['Household consumption', 'Exports'], values: [[40, 25], [50, 20], [60, 5]] },
  valueAdded: { codes: ['COE', 'GOS'], labels: ['Compensation of employees', 'Surplus'], values: [[40, 35, 40], [30, 30, 25]] },
};

beforeEach(() => {
  restoreViews(defaultViews());
});

describe('views state', () => {
  it('is plain data: a snapshot survives JSON and restores to the same state', () => {
    loadScenarios(demoScenarioList());
    viewState.measure = 'JOBS';
    viewState.household = { use: true, income: ['COE'], consumption: 'HHC', propensity: 0.8 };
    viewState.sensitivity.edits.push({ row: 'FISH', col: 'FOOD', value: 0.2 });
    viewState.multipliers.show = 'type';
    const snap = snapshotViews();
    const text = JSON.stringify(snap);
    restoreViews(defaultViews());
    expect(viewState.scenarios).toEqual([]);
    const notes = restoreViews(JSON.parse(text));
    expect(notes).toEqual([]);
    expect(snapshotViews()).toEqual(snap);
  });

  it('restores what it can from a damaged snapshot and names every problem', () => {
    const notes = restoreViews({
      version: 1,
      measure: 7,
      household: { use: 'yes' },
      scenarios: [
        { name: 'Good', changes: [{ sector: 'A', basis: 'percent', value: 5, localShare: 0.5, category: 'HH', note: '' }] },
        { name: 'No changes' },
        { name: 'Bad cells', changes: [{ sector: 'B', basis: 'weight', value: 'ten' }, { amount: 3 }] },
      ],
      sensitivity: { edits: [{ row: 'A', col: 'B', value: 0.1 }, { row: 'A' }], draws: 1e9, cv: -3 },
    });
    expect(notes.join('\n')).toMatch(/measure: not a measure code/);
    expect(notes.join('\n')).toMatch(/household: not a household setting/);
    expect(notes.join('\n')).toMatch(/scenarios\[1\]: not a scenario/);
    expect(notes.join('\n')).toMatch(/scenarios\[2\]\.changes\[0\]\.basis: 'weight'/);
    expect(notes.join('\n')).toMatch(/scenarios\[2\]\.changes\[0\]\.value: "ten" is not a number/);
    expect(notes.join('\n')).toMatch(/scenarios\[2\]\.changes\[1\]: not a demand change/);
    expect(notes.join('\n')).toMatch(/sensitivity\.edits\[1\]/);
    expect(viewState.measure).toBe('output');
    expect(viewState.household).toBeNull();
    expect(viewState.scenarios.map((s) => s.name)).toEqual(['Good', 'Bad cells']);
    expect(viewState.scenarios[1]!.changes).toEqual([{ sector: 'B', basis: 'amount', value: null, localShare: null, category: '', note: '' }]);
    expect(viewState.sensitivity.edits).toEqual([{ row: 'A', col: 'B', value: 0.1 }]);
    expect(viewState.sensitivity.draws).toBe(50_000);
    expect(viewState.sensitivity.cv).toBe(10);
    expect(restoreViews('nonsense')).toEqual(['the saved views are not an object; the defaults are used']);
    expect(restoreViews({ version: 9 })[0]).toMatch(/version 9/);
  });

  it('drafts convert to the engine’s scenarios and back, through the scenario file format', () => {
    const list = demoScenarioList();
    expect(list.map((s) => s.name)).toEqual(['New seafood processing plant', 'Fall in visitor spending', 'Coastal health centre']);
    const back = list.map((s) => scenarioOf(draftOf(s)));
    expect(back).toEqual(list);
    expect(readScenarios(writeScenarios(back), 'x.json')).toEqual(list);
    // An empty number stays absent, so the engine names the problem instead of reading 0.
    const t = makeTable(small);
    const s = scenarioOf({ id: 'x', name: 'Half done', description: '', changes: [{ sector: 'A', basis: 'percent', value: null, localShare: null, category: '', note: '' }] });
    expect(s.changes[0]).toEqual({ sector: 'A' });
    expect(checkScenario(t, s).map((f) => f.code)).toEqual(['amount-or-percent']);
  });

  it('adds, renames, duplicates and deletes scenarios, keeping names unique', () => {
    const a = addScenario('Plan');
    const b = addScenario('Plan');
    expect(b.name).toBe('Plan (2)');
    expect(renameScenario(b.id, 'Plan')).toMatch(/already called 'Plan'/);
    expect(renameScenario(b.id, '  ')).toBe('a scenario needs a name');
    expect(renameScenario(b.id, 'Other')).toBeNull();
    addChange(a.id, 'A');
    addChange(a.id, 'B');
    viewState.scenarios[0]!.changes[0]!.value = 12;
    removeChange(a.id, 1);
    const c = duplicateScenario(a.id)!;
    expect(c.name).toBe('Plan (copy)');
    expect(viewState.scenarios.map((s) => s.name)).toEqual(['Plan', 'Plan (copy)', 'Other']);
    expect(viewState.activeScenario).toBe(c.id);
    // The copy is independent.
    viewState.scenarios[1]!.changes[0]!.value = 99;
    expect(viewState.scenarios[0]!.changes[0]!.value).toBe(12);
    viewState.results.base = c.id;
    deleteScenario(c.id);
    expect(viewState.scenarios.map((s) => s.name)).toEqual(['Plan', 'Other']);
    expect(viewState.results.base).toBeNull();
    expect(viewState.activeScenario).toBe(viewState.scenarios[1]!.id);
    expect(scenariosForProject()).toEqual([{ name: 'Plan', changes: [{ sector: 'A', amount: 12 }] }, { name: 'Other', changes: [] }]);
    expect(uniqueName('Plan (2)', ['Plan (2)', 'Plan (3)'])).toBe('Plan (4)');
  });

  it('fits the settings to a table: unknown measure, rows and edited sectors are dropped, scenarios kept', () => {
    loadScenarios([{ name: 'Elsewhere', changes: [{ sector: 'ZZ', amount: 1 }] }]);
    viewState.measure = 'GHG';
    viewState.household = { use: true, income: ['WAGES'], consumption: 'HH', propensity: null };
    viewState.sensitivity.edits = [
      { row: 'A', col: 'B', value: 0.3 },
      { row: 'A', col: 'Q', value: 0.1 },
    ];
    const notes = syncViewsToTable(small, ['output', 'value-added']);
    expect(notes.length).toBe(3);
    expect(viewState.measure).toBe('output');
    expect(viewState.household).toBeNull();
    expect(viewState.sensitivity.edits).toEqual([{ row: 'A', col: 'B', value: 0.3 }]);
    expect(viewState.sensitivity.sector).toBe('A');
    expect(viewState.scenarios.length).toBe(1);
    expect(syncViewsToTable(small, ['output'])).toEqual([]);
  });

  it('passes the household choice to the worker as guess, none or the rows', () => {
    expect(householdArg(null)).toBe('guess');
    expect(householdArg({ use: false, income: [], consumption: '', propensity: null })).toBe('none');
    expect(householdArg({ use: true, income: ['COE'], consumption: 'HH', propensity: null })).toEqual({ income: ['COE'], consumption: 'HH' });
    expect(householdArg({ use: true, income: ['COE'], consumption: 'HH', propensity: 0.7 })).toEqual({ income: ['COE'], consumption: 'HH', propensity: 0.7 });
  });
});
