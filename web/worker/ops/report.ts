/**
 * Reports in the browser: the same report as the command line's `ripplewise report` (checks,
 * multipliers of every measure, linkages and key sectors, the sensitivity tornado and, with
 * scenarios, each scenario's impact and their comparison), built from src/report's one report
 * model in the worker and written as HTML, XLSX, CSV or JSON. Inputs are named with their
 * SHA-256 (crypto.subtle); the general cautions are in every format (src/report adds them).
 */
import { checkScenario, impacts, linkages, multipliers, resolveScenario, sectorIndex, tornado } from '../../../engine/index';
import type { Impact, ResultTarget, Scenario } from '../../../engine/index';
import { writeScenarios } from '../../../src/project/scenarios';
import type { ReportInputFile, ReportSetting, Section } from '../../../src/report/model';
import { buildReport, checksSection, comparisonSection, linkagesSection, modelAssumptions, multipliersSection, scenarioSection, setting, textSection, tornadoSection } from '../../../src/report/model';
import type { Report } from '../../../src/report/model';
import { digestHex } from '../../../src/report/sha256';
import { closureSettings, roundsSetting } from '../../../src/report/closure-settings';
import { conventionLines, conventions } from '../../../engine/conventions';
import type { ReportFormat } from '../../../src/report/write';
import { version } from '../../../package.json';
import { InputError } from '../../../engine/index';
import type { Handler } from '../context';
import type { HouseholdChoice } from './models';
import { analysisModels } from './models';
import { current, openModel } from './session';
import { regionalReportParts } from './regional';
import type { BalanceRequest, RegionalRequest } from './regional';

export const TOOL = { name: 'ripplewise', version } as const;

export interface ReportRequest {
  title?: string;
  /** The table's source: its file name, SHA-256, size and sheet; the page's own record of what it opened. */
  source: { name: string; sha256: string; bytes?: number; sheet?: string; role?: string }[];
  scenarios?: Scenario[];
  household?: HouseholdChoice;
  /** The tornado: a sector's output multiplier, or (default with scenarios) the first usable scenario's total output. */
  tornado?: { sector?: string; scenario?: string; percent?: number; top?: number } | false;
  locale?: string;
  /** Findings of the reader that opened the file (layout, conventions), reported with the checks'. */
  readFindings?: import('../../../engine/index').Finding[];
  /** Settings of the workbench to state in the report (layout mapping, kind of table...). */
  settings?: ReportSetting[];
  createdAt?: string;
  /** Split the indirect effect into the first round and the later rounds (industrial support), as `--split rounds`. */
  rounds?: boolean;
  /** The edits made to the table in the workbench since it was read, one line each. */
  edits?: string[];
  /** The Regionalise step's last run and the Balance tool's, when used (their sections are added). */
  regional?: RegionalRequest;
  balance?: BalanceRequest;
}

/** The report's formats, and the tidy CSV of the impacts (src/report/tidy-csv.ts). */
export type ExportFormat = ReportFormat | 'tidy-csv';

export interface ReportFile {
  format: ExportFormat;
  name: string;
  mime: string;
  /** Text for HTML, CSV and JSON; bytes for XLSX. */
  data: string | Uint8Array;
}

const MIME: Record<ExportFormat, string> = {
  'tidy-csv': 'text/csv;charset=utf-8',
  html: 'text/html;charset=utf-8',
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
  csv: 'text/csv;charset=utf-8',
  json: 'application/json',
};

/** Build the report model from the current table and the page's settings. */
export async function buildWorkbenchReport(req: ReportRequest, keep: { impacts?: Impact[] } = {}): Promise<Report> {
  const s = current();
  const t = s.table;
  const a = analysisModels(req.household);
  const models = a.models;
  const list = Array.isArray(req.scenarios) ? req.scenarios : [];
  const usable = list.filter((sc) => !checkScenario(t, sc).length).map((sc) => resolveScenario(t, sc));
  const skipped = list.filter((sc) => checkScenario(t, sc).length);
  const rounds = req.rounds === true;
  const mult = multipliers(models, a.measures, { rounds });
  const link = linkages(t, openModel());
  const results = usable.length ? impacts(models, usable, a.measures, { rounds }) : [];
  keep.impacts = results;
  const settings: ReportSetting[] = [...(req.settings ?? [])];
  const h = a.household;
  if (h.used && h.options) {
    settings.push(setting('householdColumn', 'Household consumption column', h.options.consumption, h.choice === 'custom' ? 'given' : 'guessed'));
    const inc = Array.isArray(h.options.income) ? h.options.income : [h.options.income];
    settings.push(setting('labourIncomeRow', 'Labour-income row(s)', inc.join(', '), h.choice === 'custom' ? 'given' : 'guessed'));
    // The basis, its figure and the implied spending share, in the command line's words.
    if (models.closure) settings.push(...closureSettings(models.closure, { basisGiven: (h.choice === 'custom' && h.options.basis !== undefined) || h.options.propensity !== undefined || h.options.householdIncome !== undefined, propensity: h.options.propensity }));
  } else if (h.choice === 'none') settings.push(setting('household', 'Household closure (Type II)', 'off', 'given', 'Open model only'));
  else settings.push(setting('household', 'Household closure (Type II)', 'not used', 'guessed', h.problem));
  settings.push(setting('measures', 'Measures', a.measures.map((m) => m.code).join(', '), 'default'));
  if (rounds) settings.push(roundsSetting());

  const sections: Section[] = [];
  if (usable.length) {
    settings.push(setting('scenarios', 'Scenarios', usable.map((r) => r.name).join('; '), 'given'));
    if (results.length > 1) sections.push(comparisonSection(results));
    usable.forEach((r, k) => sections.push(scenarioSection(r, results[k]!, { index: k + 1 })));
  }
  if (skipped.length) settings.push(setting('scenariosLeftOut', 'Scenarios left out (not ready)', skipped.map((x) => x.name).join('; '), 'given', 'Each has a problem shown in the scenario builder'));
  sections.push(multipliersSection(mult), linkagesSection(link));

  if (req.tornado !== false) {
    const o = req.tornado ?? {};
    const percent = o.percent ?? 10;
    const top = o.top ?? 10;
    const money = mult[0]!.measure.unit;
    let target: ResultTarget;
    let what: string;
    let unit: string;
    const sc = o.scenario !== undefined ? usable.find((r) => r.name === o.scenario) : undefined;
    if (o.sector) {
      const j = sectorIndex(t, o.sector);
      target = { kind: 'multiplier', sector: j };
      what = `Output multiplier of ${t.sectors.codes[j]} (${t.sectors.labels[j]})`;
      unit = `${money} per ${money} of final demand`;
    } else if (sc || usable.length) {
      const r = sc ?? usable[0]!;
      target = { kind: 'impact', d: r.demand };
      what = `Total output impact of '${r.name}' (open model)`;
      unit = money;
    } else {
      const om = openModel().outputMultipliers();
      let j = 0;
      for (let i = 1; i < om.length; i++) if (om[i]! > om[j]!) j = i;
      target = { kind: 'multiplier', sector: j };
      what = `Output multiplier of ${t.sectors.codes[j]} (${t.sectors.labels[j]}), the largest`;
      unit = `${money} per ${money} of final demand`;
    }
    const data = tornado(openModel(), target, { top, percent });
    sections.push(tornadoSection({ data, sectors: t.sectors, target: what, unit }));
    settings.push(setting('tornado', 'Sensitivity tornado', what, o.sector || o.scenario ? 'given' : 'default'), setting('tornadoPercent', 'Tornado swing (%)', percent, o.percent !== undefined ? 'given' : 'default'), setting('tornadoTop', 'Tornado coefficients', top, o.top !== undefined ? 'given' : 'default'));
  } else settings.push(setting('tornado', 'Sensitivity tornado', 'off', 'given'));

  if (req.edits?.length) {
    sections.push(textSection('edits', 'Edits to the table', 'Cells and details changed in the workbench after the table was read from its source, in order.', req.edits.map((e, k) => `${k + 1}. ${e}`)));
    settings.push(setting('edits', 'Edits to the table after reading', req.edits.length, 'given', 'Listed in the section Edits to the table'));
  }
  const extra = regionalReportParts(req.regional, req.balance);
  sections.push(...extra.sections);
  settings.push(...extra.settings);
  const checks = [...(req.readFindings ?? []), ...s.findings];
  const typeII = h.used ? 'closed' : h.choice === 'none' ? 'off' : 'not-found';
  sections.push(checksSection(checks, { condition: openModel().condition() }));

  const inputs: ReportInputFile[] = (req.source ?? []).map((x) => {
    if (!/^[0-9a-f]{64}$/.test(String(x.sha256))) throw new InputError('bad-input', `the SHA-256 of ${x.name} is missing or malformed`);
    const f: ReportInputFile = { role: x.role ?? 'table', name: x.name, sha256: x.sha256 };
    if (x.bytes !== undefined) f.bytes = x.bytes;
    if (x.sheet !== undefined) f.sheet = x.sheet;
    return f;
  });
  inputs.push(...extra.inputs);
  if (list.length) {
    const bytes = new TextEncoder().encode(writeScenarios(list));
    inputs.push({ role: 'scenarios', name: 'scenarios (built in the workbench)', sha256: await digestHex(bytes), bytes: bytes.length });
  }
  const title = req.title?.trim() || (usable.length ? (usable.length === 1 ? `Impact of ${usable[0]!.name}` : `Impacts of ${usable.length} scenarios`) : `Input-output report: ${t.meta.title ?? inputs[0]?.name ?? 'table'}`);
  return buildReport({
    title,
    subtitle: t.meta.title ?? inputs[0]?.name ?? 'table',
    table: t,
    tool: { ...TOOL },
    createdAt: req.createdAt ?? new Date().toISOString(),
    locale: req.locale ?? 'en',
    inputs,
    settings,
    assumptions: [...modelAssumptions(t, models.closure, { typeII }), ...conventionLines(conventions(models, a.measures, { typeII }), { closure: false, rounds })],
    findings: [...checks, ...(models.closure?.findings ?? []), ...link.findings, ...results.flatMap((r) => r.findings), ...extra.findings],
    sections,
  });
}

/** A file name from a title: letters, digits and dashes. */
export function fileStem(title: string): string {
  const s = title
    .normalize('NFKD')
    .replace(/[^\w\s-]/g, '')
    .trim()
    .replace(/\s+/g, '-')
    .toLowerCase()
    .slice(0, 60);
  return s || 'report';
}

export const reportOps: Record<string, Handler> = {
  /** The report written in the formats asked for (default all four). */
  'report-export': async (args: ReportRequest & { formats?: ExportFormat[] }, ctx): Promise<{ title: string; files: ReportFile[]; cautions: string[] }> => {
    ctx.progress(0, 'building the report');
    const kept: { impacts?: Impact[] } = {};
    const report = await buildWorkbenchReport(args, kept);
    const formats = args.formats?.length ? args.formats : (['html', 'xlsx', 'csv', 'json'] as ExportFormat[]);
    const files: ReportFile[] = [];
    const stem = fileStem(report.title);
    for (const [k, f] of formats.entries()) {
      await ctx.checkpoint();
      ctx.progress(0.2 + (0.8 * k) / formats.length, `writing ${f.toUpperCase()}`);
      let data: string | Uint8Array;
      if (f === 'html') data = (await import('../../../src/report/html')).writeHtml(report, args.locale ? { locale: args.locale } : {});
      else if (f === 'xlsx') data = await (await import('../../../src/report/xlsx')).writeXlsx(report);
      else if (f === 'csv') data = (await import('../../../src/report/csv')).writeCsv(report);
      else if (f === 'json') data = (await import('../../../src/report/json')).writeJson(report);
      else if (f === 'tidy-csv') data = (await import('../../../src/report/tidy-csv')).writeTidyCsv(kept.impacts ?? [], { title: report.title, cautions: report.cautions });
      else throw new InputError('bad-format', `reports are written as html, xlsx, csv, json or tidy-csv; got '${String(f)}'`);
      files.push({ format: f, name: f === 'tidy-csv' ? `${stem}.tidy.csv` : `${stem}.${f}`, mime: MIME[f], data });
    }
    for (const f of files) if (f.data instanceof Uint8Array) ctx.transfer(f.data.buffer as ArrayBuffer);
    ctx.progress(1);
    return { title: report.title, files, cautions: report.cautions };
  },
};
