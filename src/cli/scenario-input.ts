/** Reading a scenario file for a command, with every problem against the table named at once. */
import { InputError } from '../../engine/errors';
import type { ResolvedScenario, Scenario } from '../../engine/scenario';
import { checkScenario, resolveScenario } from '../../engine/scenario';
import type { Table } from '../../engine/table';
import { checkScenarioCells } from '../io/limits';
import { readScenarios } from '../project/scenarios';
import type { CliContext } from './context';
import { UsageError } from './errors';
import type { InputFile } from './files';
import { readInput } from './files';

export interface LoadedScenarios {
  file: InputFile;
  scenarios: Scenario[];
  resolved: ResolvedScenario[];
}

/**
 * Read scenarios (all, or those named), check each against the table, resolve their demand vectors.
 * `holdsResults: false` (a sweep, which streams each unit's results to disk) leaves out the limit on
 * scenarios × sectors, which bounds the results a command holds in memory.
 */
export async function loadScenarios(ctx: CliContext, name: string, t: Table, only?: string[], o: { holdsResults?: boolean } = {}): Promise<LoadedScenarios> {
  const file = await readInput(ctx, name, 'scenario');
  const all = readScenarios(new TextDecoder('utf-8').decode(file.bytes), name);
  let chosen = all;
  if (only && only.length) {
    chosen = only.map((n) => {
      const s = all.find((x) => x.name === n) ?? all.find((x) => x.name.toLowerCase() === n.toLowerCase());
      if (!s) throw new UsageError(`${name}: there is no scenario named '${n}'`, 'unknown-scenario', `The file has: ${all.map((x) => `'${x.name}'`).join(', ')}`);
      return s;
    });
  }
  if (o.holdsResults !== false) checkScenarioCells(chosen.length, t.sectors.codes.length, name);
  const problems: string[] = [];
  for (const s of chosen) for (const f of checkScenario(t, s)) problems.push(f.message);
  if (problems.length) {
    throw new InputError('bad-scenario', `${name}: ${problems.length} problem${problems.length > 1 ? 's' : ''} with the scenarios against this table: ${problems.slice(0, 8).join('; ')}${problems.length > 8 ? '; …' : ''}`, { file: name });
  }
  return { file, scenarios: chosen, resolved: chosen.map((s) => resolveScenario(t, s)) };
}
