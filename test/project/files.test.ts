/**
 * Project and scenario files: validated on load, with errors that name the file and the path or
 * line of the problem (common practice: a JSON error should point at the line and column).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { readProject, readScenarios, writeProject, writeScenarios, parseJson } from '../../src/project';
import type { PlainTable } from '../../engine/table';

const table: PlainTable = {
  sectors: { codes: ['A', 'B'], labels: ['Alpha', 'Beta'] },
  Z: [[1, 2], [3, 4]],
  finalDemand: { codes: ['HH'], values: [[7], [3]] },
  x: [10, 10],
  meta: { currency: 'EUR' },
};

describe('scenario files', () => {
  it('read the demo scenarios (invented) and round-trip them', () => {
    const s = readScenarios(readFileSync('data-demo/scenarios.json', 'utf8'), 'scenarios.json');
    expect(s.map((x) => x.name)).toEqual(['New seafood processing plant', 'Fall in visitor spending', 'Coastal health centre']);
    expect(readScenarios(writeScenarios(s), 'again.json')).toEqual(s);
  });

  it('accept one scenario object on its own', () => {
    const s = readScenarios('{"name":"One","changes":[{"sector":"A","amount":5}]}', 'one.json');
    expect(s).toEqual([{ name: 'One', changes: [{ sector: 'A', amount: 5 }] }]);
  });

  it('name the file, line and column of broken JSON', () => {
    expect(() => readScenarios('{\n  "name": "x",\n  "changes": [ { "sector": "A" "amount": 1 } ]\n}', 'broken.json')).toThrow(/broken.json: not valid JSON at line 3, column \d+ \(near/);
    expect(() => parseJson('   ', 'empty.json')).toThrow(/empty.json: the file is empty/);
  });

  it('name the path of a bad field', () => {
    const doc = (changes: string) => `{"format":"ripplewise-scenarios","version":1,"scenarios":[{"name":"S","changes":[${changes}]}]}`;
    expect(() => readScenarios(doc('{"sector":"A","amount":"ten"}'), 's.json')).toThrow(/s.json: scenarios\[0\].changes\[0\].amount should be a finite number; found 'ten'/);
    expect(() => readScenarios(doc('{"amount":1}'), 's.json')).toThrow(/scenarios\[0\].changes\[0\].sector should be text; found nothing/);
    expect(() => readScenarios('{"format":"ripplewise-scenarios","version":9,"scenarios":[]}', 's.json')).toThrow(/version 9, newer than this program reads/);
    expect(() => readScenarios('{"format":"other","version":1}', 's.json')).toThrow(/format should be 'ripplewise-scenarios'/);
    expect(() => readScenarios('{"format":"ripplewise-scenarios","version":1,"scenarios":[{"name":"S","changes":[]},{"name":"S","changes":[]}]}', 's.json')).toThrow(/a name no other scenario has/);
  });
});

describe('project files', () => {
  const project = {
    tool: { name: 'ripplewise', version: '0.1.0' },
    table,
    source: { name: 'input.csv', sha256: 'abc', mapping: { codeColumn: 1 } },
    scenarios: [{ name: 'S', changes: [{ sector: 'A', amount: 1 }] }],
    settings: { householdColumn: 'HH', draws: 500, dark: true, none: null },
  };

  it('round-trip', () => {
    const text = writeProject({ ...project, savedAt: '2026-12-01T00:00:00.000Z' });
    const back = readProject(text, 'p.json');
    expect(back).toEqual({ ...project, savedAt: '2026-12-01T00:00:00.000Z' });
  });

  it('refuse a table that the engine cannot use, naming the problem', () => {
    const bad = JSON.parse(writeProject(project));
    bad.table.Z = [[1, 2], [3]];
    expect(() => readProject(JSON.stringify(bad), 'p.json')).toThrow(/p.json: the table in this project is not usable: intermediate flows Z: row 2 has 1 values where row 1 has 2/);
    bad.table.Z = [[1, 'x'], [3, 4]];
    expect(() => readProject(JSON.stringify(bad), 'p.json')).toThrow(/table.Z\[0\]\[1\] should be a finite number; found 'x'/);
  });

  it('refuse settings that are not plain values', () => {
    const bad = JSON.parse(writeProject(project));
    bad.settings.nested = { a: 1 };
    expect(() => readProject(JSON.stringify(bad), 'p.json')).toThrow(/settings.nested should be text, a number, true\/false or null/);
  });
});
