/**
 * Tables for the command-line tests, written to a temporary folder with the project's own
 * writers (src/io).
 *
 * The two-sector economy is the worked example of Miller and Blair, Input-Output Analysis,
 * 2nd ed. (2009), chapter 2 (from memory): Z = [[150, 500], [200, 100]], x = [1000, 2000], final
 * demand [350, 1700], value added [650, 1400]. The split of its final demand into households and
 * exports and of its value added into compensation and other value added, and the jobs row, are
 * ours (they feed the Type II closure, which the tests check against ml-matrix, not against the book).
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { PlainTable } from '../../engine/table';
import { makeTable } from '../../engine/table';
import { writeTableCsv, writeTableJson, writeTableXlsx } from '../../src/io/index';
import { tempDir } from './harness';

export const TWO_SECTORS: PlainTable = {
  sectors: { codes: ['S1', 'S2'], labels: ['Agriculture', 'Manufacturing'] },
  Z: [
    [150, 500],
    [200, 100],
  ],
  finalDemand: { codes: ['HH', 'EXP'], labels: ['Household consumption', 'Exports'], values: [[200, 150], [1000, 700]] },
  valueAdded: { codes: ['COE', 'GOS'], labels: ['Compensation of employees', 'Gross operating surplus'], values: [[300, 900], [350, 500]] },
  x: [1000, 2000],
  satellites: [{ code: 'JOBS', label: 'Employment', unit: 'jobs', values: [30, 0] }],
  meta: { title: 'Two-sector example', currency: 'USD', scaleLabel: 'millions', year: 2009 },
};

/** Column sums of A above 1: not productive, so its checks fail. */
export const UNPRODUCTIVE: PlainTable = {
  sectors: { codes: ['A', 'B'], labels: ['Alpha', 'Beta'] },
  Z: [
    [60, 50],
    [50, 60],
  ],
  finalDemand: { codes: ['F'], values: [[-10], [-10]] },
  valueAdded: { codes: ['V'], values: [[-10, -10]] },
  x: [100, 100],
};

export interface Fixtures {
  dir: string;
  json: string;
  csv: string;
  xlsx: string;
  bad: string;
  scenario: string;
  concordance: string;
}

export async function writeFixtures(): Promise<Fixtures> {
  const dir = tempDir();
  const t = makeTable(TWO_SECTORS);
  const f: Fixtures = {
    dir,
    json: join(dir, 'two.json'),
    csv: join(dir, 'two.csv'),
    xlsx: join(dir, 'two.xlsx'),
    bad: join(dir, 'bad.json'),
    scenario: join(dir, 'scenario.json'),
    concordance: join(dir, 'groups.csv'),
  };
  writeFileSync(f.json, writeTableJson(t));
  writeFileSync(f.csv, writeTableCsv(t));
  writeFileSync(f.xlsx, await writeTableXlsx(t, { sheet: 'IO' }));
  writeFileSync(f.bad, JSON.stringify(UNPRODUCTIVE));
  // Final demand from [350, 1700] to [600, 1500] (Miller and Blair's second demand vector, from memory).
  writeFileSync(f.scenario, JSON.stringify({ format: 'ripplewise-scenarios', version: 1, scenarios: [{ name: 'New demand', changes: [{ sector: 'S1', amount: 250 }, { sector: 'S2', amount: -200 }] }, { name: 'Exports up', changes: [{ sector: 'S2', percent: 10, category: 'EXP' }] }] }));
  writeFileSync(f.concordance, 'code,group,label\nS1,ALL,Whole economy\nS2,ALL,Whole economy\n');
  return f;
}
