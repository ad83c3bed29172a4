/**
 * A sweep folder for the tests: the two-sector worked example of Miller and Blair (2009), ch. 2
 * (from memory; see test/cli/fixtures.ts, with our split of final demand and value added for the
 * Type II closure), a scenario file and a plan, written to a temporary folder.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { makeTable } from '../../engine/table';
import { writeTableCsv } from '../../src/io/index';
import { writeScenarios } from '../../src/project/scenarios';
import { TWO_SECTORS } from '../cli/fixtures';
import { tempDir } from '../cli/harness';

export interface SweepFolder {
  dir: string;
  plan: string;
  table: string;
  scenarios: string;
}

export const SCENARIOS = [
  { name: 'Farm exports', changes: [{ sector: 'S1', amount: 100 }] },
  { name: 'Factory', changes: [{ sector: 'S2', amount: 50, localShare: 0.8 }] },
  { name: 'Both', changes: [{ sector: 'S1', amount: 10 }, { sector: 'S2', amount: 20 }] },
];

export function sweepFolder(plan: Record<string, unknown> = {}): SweepFolder {
  const dir = tempDir();
  const table = join(dir, 'two.csv');
  writeFileSync(table, writeTableCsv(makeTable(TWO_SECTORS)));
  const scenarios = join(dir, 'scenarios.json');
  writeFileSync(scenarios, writeScenarios(SCENARIOS));
  const p = join(dir, 'plan.json');
  writeFileSync(
    p,
    JSON.stringify({
      format: 'ripplewise-sweep',
      version: 1,
      name: 'Test sweep',
      seed: 11,
      draws: 6,
      tables: [{ name: 'two', file: 'two.csv', householdColumn: 'HH', labourIncomeRow: 'COE' }],
      scenarios: [{ file: 'scenarios.json' }],
      parameters: { household: ['off', 'table', 0.5], cv: [0, 0.1] },
      rowsPerGroup: 40,
      ...plan,
    }),
  );
  return { dir, plan: p, table, scenarios };
}
