/**
 * The project file: everything needed to take up the work again, as one JSON document.
 *
 *   { "format": "ripplewise-project", "version": 1, "savedAt": "2026-12-01T10:00:00.000Z",
 *     "tool": { "name": "ripplewise", "version": "0.1.0" },
 *     "table": { ...the table as plain arrays (engine/table.ts PlainTable)... },
 *     "source": { "name": "use.xlsx", "sha256": "…", "mapping": { ...the confirmed layout... } },
 *     "scenarios": [ ...as in the scenario file... ],
 *     "settings": { "householdColumn": "HHC", "labourIncomeRow": "COE", ... } }
 *
 * It is validated on load: the header and version, the structure with the path of any bad field,
 * and the table through the engine's own structural checks.
 */
import type { PlainTable } from '../../engine/table';
import { makeTable } from '../../engine/table';
import type { Scenario } from '../../engine/scenario';
import { InputError } from '../../engine/errors';
import { Checker } from './check';
import { parseJson } from './json';
import { scenarioFrom } from './scenarios';

export const PROJECT_FORMAT = 'ripplewise-project';
export const PROJECT_VERSION = 1;

export type SettingValue = string | number | boolean | null;

export interface ProjectSource {
  name: string;
  sha256?: string;
  /** The confirmed layout mapping of the source file (see src/io), kept as given. */
  mapping?: Record<string, unknown>;
}

export interface Project {
  savedAt: string;
  tool: { name: string; version: string };
  table: PlainTable;
  source?: ProjectSource;
  scenarios: Scenario[];
  settings: Record<string, SettingValue>;
}

export function readProject(text: string, file: string): Project {
  const c = new Checker(file);
  const o = c.object(parseJson(text, file), '');
  c.header(o, PROJECT_FORMAT, PROJECT_VERSION);
  const tool = c.object(o.tool, 'tool');
  const table = plainTable(c, c.object(o.table, 'table'));
  try {
    makeTable(table);
  } catch (e) {
    if (e instanceof InputError) throw new InputError(e.code, `${file}: the table in this project is not usable: ${e.message}`, { ...e.where, file });
    throw e;
  }
  const p: Project = {
    savedAt: c.string(o.savedAt, 'savedAt'),
    tool: { name: c.string(tool.name, 'tool.name'), version: c.string(tool.version, 'tool.version') },
    table,
    scenarios: c.array(o.scenarios ?? [], 'scenarios').map((s, i) => scenarioFrom(c, c.object(s, `scenarios[${i}]`), `scenarios[${i}].`)),
    settings: {},
  };
  if (o.source !== undefined) {
    const s = c.object(o.source, 'source');
    p.source = { name: c.string(s.name, 'source.name') };
    const sha = c.optString(s.sha256, 'source.sha256');
    if (sha !== undefined) p.source.sha256 = sha;
    if (s.mapping !== undefined) p.source.mapping = c.object(s.mapping, 'source.mapping');
  }
  const settings = c.object(o.settings ?? {}, 'settings');
  for (const [k, v] of Object.entries(settings)) {
    if (v !== null && !['string', 'number', 'boolean'].includes(typeof v)) c.fail(`settings.${k}`, 'text, a number, true/false or null', v);
    p.settings[k] = v as SettingValue;
  }
  return p;
}

export function writeProject(p: Omit<Project, 'savedAt'> & { savedAt?: string }): string {
  const doc = {
    format: PROJECT_FORMAT,
    version: PROJECT_VERSION,
    savedAt: p.savedAt ?? new Date().toISOString(),
    tool: p.tool,
    table: p.table,
    ...(p.source ? { source: p.source } : {}),
    scenarios: p.scenarios,
    settings: p.settings,
  };
  return JSON.stringify(doc) + '\n';
}

/** The plain table inside a project, checked field by field so that errors carry a path. */
function plainTable(c: Checker, t: Record<string, unknown>): PlainTable {
  const sectors = c.object(t.sectors, 'table.sectors');
  const codes = c.strings(sectors.codes, 'table.sectors.codes');
  const out: PlainTable = {
    sectors: { codes, ...(sectors.labels !== undefined ? { labels: c.strings(sectors.labels, 'table.sectors.labels') } : {}) },
    Z: c.array(t.Z, 'table.Z').map((r, i) => c.numbers(r, `table.Z[${i}]`)),
  };
  const block = (v: unknown, path: string) => {
    const b = c.object(v, path);
    return {
      codes: c.strings(b.codes, `${path}.codes`),
      ...(b.labels !== undefined ? { labels: c.strings(b.labels, `${path}.labels`) } : {}),
      values: c.array(b.values, `${path}.values`).map((r, i) => c.numbers(r, `${path}.values[${i}]`)),
    };
  };
  if (t.finalDemand !== undefined) out.finalDemand = block(t.finalDemand, 'table.finalDemand');
  if (t.valueAdded !== undefined) out.valueAdded = block(t.valueAdded, 'table.valueAdded');
  if (t.imports !== undefined) out.imports = c.numbers(t.imports, 'table.imports');
  if (t.x !== undefined) out.x = c.numbers(t.x, 'table.x');
  if (t.satellites !== undefined) {
    out.satellites = c.array(t.satellites, 'table.satellites').map((s, i) => {
      const o = c.object(s, `table.satellites[${i}]`);
      const label = c.optString(o.label, `table.satellites[${i}].label`);
      return {
        code: c.string(o.code, `table.satellites[${i}].code`),
        ...(label !== undefined ? { label } : {}),
        unit: c.string(o.unit, `table.satellites[${i}].unit`),
        values: c.numbers(o.values, `table.satellites[${i}].values`),
      };
    });
  }
  if (t.meta !== undefined) out.meta = c.object(t.meta, 'table.meta') as PlainTable['meta'];
  return out;
}
