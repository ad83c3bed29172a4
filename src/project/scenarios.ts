/**
 * The scenario file: one or more named scenarios of demand changes, as JSON.
 *
 *   { "format": "ripplewise-scenarios", "version": 1,
 *     "scenarios": [ { "name": "...", "description": "...",
 *                      "changes": [ { "sector": "HOSP", "amount": 25, "localShare": 0.8 },
 *                                   { "sector": "FOOD", "percent": -10, "category": "EXP" } ] } ] }
 *
 * A single scenario object ({ "name", "changes" }) is accepted too. Structure is checked here,
 * with the path of any bad field; whether sectors and categories exist is checked against the
 * table by the engine (engine/scenario.ts).
 */
import type { DemandChange, Scenario } from '../../engine/scenario';
import { Checker } from './check';
import { parseJson } from './json';

export const SCENARIOS_FORMAT = 'ripplewise-scenarios';
export const SCENARIOS_VERSION = 1;

export function readScenarios(text: string, file: string): Scenario[] {
  const doc = parseJson(text, file);
  const c = new Checker(file);
  const o = c.object(doc, '');
  if (o.format === undefined && Array.isArray(o.changes)) return [scenarioFrom(c, o, '')];
  c.header(o, SCENARIOS_FORMAT, SCENARIOS_VERSION);
  const list = c.array(o.scenarios, 'scenarios');
  if (!list.length) c.fail('scenarios', 'a list of at least one scenario', list);
  const out = list.map((s, i) => scenarioFrom(c, c.object(s, `scenarios[${i}]`), `scenarios[${i}].`));
  const seen = new Set<string>();
  out.forEach((s, i) => {
    if (seen.has(s.name)) c.fail(`scenarios[${i}].name`, 'a name no other scenario has', s.name);
    seen.add(s.name);
  });
  return out;
}

export function scenarioFrom(c: Checker, o: Record<string, unknown>, at: string): Scenario {
  const name = c.string(o.name, `${at}name`).trim();
  if (!name) c.fail(`${at}name`, 'a non-empty name', o.name);
  const changes = c.array(o.changes, `${at}changes`).map((x, j) => changeFrom(c, c.object(x, `${at}changes[${j}]`), `${at}changes[${j}].`));
  const s: Scenario = { name, changes };
  const d = c.optString(o.description, `${at}description`);
  if (d !== undefined) s.description = d;
  return s;
}

function changeFrom(c: Checker, o: Record<string, unknown>, at: string): DemandChange {
  const sector = typeof o.sector === 'number' ? String(o.sector) : c.string(o.sector, `${at}sector`);
  const ch: DemandChange = { sector };
  const amount = c.optNumber(o.amount, `${at}amount`);
  const percent = c.optNumber(o.percent, `${at}percent`);
  const localShare = c.optNumber(o.localShare, `${at}localShare`);
  const category = c.optString(o.category, `${at}category`);
  const note = c.optString(o.note, `${at}note`);
  if (amount !== undefined) ch.amount = amount;
  if (percent !== undefined) ch.percent = percent;
  if (localShare !== undefined) ch.localShare = localShare;
  if (category !== undefined) ch.category = category;
  if (note !== undefined) ch.note = note;
  return ch;
}

export function writeScenarios(scenarios: Scenario[]): string {
  return JSON.stringify({ format: SCENARIOS_FORMAT, version: SCENARIOS_VERSION, scenarios }, null, 2) + '\n';
}
