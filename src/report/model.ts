/**
 * The report model: one plain, JSON-ready description of a report, built from engine results,
 * that every writer (HTML, XLSX, CSV, JSON) renders without computing anything. It runs in Node
 * and in the browser alike (no node: import here): the command line and the workbench build the
 * same reports.
 *
 * A report states its inputs with their SHA-256 (given as data: the caller hashes the files, with
 * node:crypto, crypto.subtle or `sha256Hex`), the tool and its version, the date, every setting
 * (and whether it was given, guessed or a default), the assumptions and the cautions, whether the
 * data is invented, and the unit of every number (each number column carries its unit).
 *
 * Numbers are plain numbers; a number that is not defined (a Type I multiplier where the direct
 * effect is 0, a tornado end past the productivity boundary) is `null`, shown blank, with a note
 * in its table saying why. A NaN never reaches a writer.
 *
 * Build it from small section functions and compose:
 *
 *   const report = buildReport({
 *     title: 'Impact of a new plant', table, tool: { name: 'ripplewise', version },
 *     inputs: [{ role: 'table', name: 'table.csv', sha256, bytes }],
 *     settings, assumptions: modelAssumptions(table, models.closure),
 *     sections: [scenarioSection(resolved, impact), multipliersSection(multipliers(models, list))],
 *   });
 */
import type { Axis, Table } from '../../engine/table';
import { moneyUnit } from '../../engine/table';
import type { Finding, Severity } from '../../engine/findings';
import { sortFindings } from '../../engine/findings';
import { describeWhere } from '../../engine/errors';
import type { Matrix } from '../../engine/linalg/matrix';
import type { Impact } from '../../engine/impact';
import { IMPACT_ABOUT } from '../../engine/impact';
import type { ResolvedScenario } from '../../engine/scenario';
import type { Multipliers } from '../../engine/multipliers';
import { MULTIPLIERS_ABOUT } from '../../engine/multipliers';
import type { Linkages } from '../../engine/linkages';
import { KEY_SECTOR_GROUPS, LINKAGES_ABOUT } from '../../engine/linkages';
import type { TornadoData } from '../../engine/tornado';
import type { HouseholdClosure } from '../../engine/household';
import { closureLine, conventions, DEFINITIONS } from '../../engine/conventions';
import type { PriceResult } from '../../engine/price';
import { PRICE_ABOUT } from '../../engine/price';
import type { Extraction, ExtractionRanking } from '../../engine/extraction';
import { EXTRACTION_ABOUT, EXTRACTION_RANKING_ABOUT } from '../../engine/extraction';
import { GHOSH_CAUTION } from '../../engine/ghosh';
import { CAUTIONS } from '../../engine/measures';
import { SENSITIVITY_CAUTIONS } from '../../engine/sensitivity';
import type { MonteCarloResult, Summary } from '../../engine/uncertainty';
import { UNCERTAINTY_CAUTIONS } from '../../engine/uncertainty';

export const REPORT_FORMAT = 'ripplewise-report';
export const REPORT_VERSION = 1;

/** A table cell: text, a number, or blank (`null`). */
export type Cell = string | number | null;

/**
 * How a number column is shown: `amount` (money or a quantity in its unit), `multiplier`,
 * `ratio` (Type I and II, dimensionless), `index` (price indices), `percent` (the value is in
 * percent: 1.5 means 1.5 %), `coefficient` (per unit of output), `count` (whole things).
 */
export type NumberStyle = 'amount' | 'multiplier' | 'ratio' | 'index' | 'percent' | 'coefficient' | 'count';

/** Fraction digits shown for each style (the file keeps every digit). */
export const STYLE_DIGITS: Readonly<Record<NumberStyle, number>> = {
  amount: 2,
  multiplier: 4,
  ratio: 3,
  index: 4,
  percent: 2,
  coefficient: 6,
  count: 0,
};

export interface Column {
  key: string;
  label: string;
  /** `text` cells are codes, labels and notes; `number` cells are numbers (or blank). */
  type: 'text' | 'number';
  /** The unit (and scale) of every number in the column: `EUR millions`, `FTE jobs`, `ratio`. */
  unit?: string;
  style?: NumberStyle;
  /** Fraction digits shown (default from the style). */
  digits?: number;
}

export interface ReportTable {
  /** A stable identifier, unique in the report: `impact-1-output`. */
  id: string;
  title: string;
  about?: string;
  columns: Column[];
  rows: Cell[][];
  /** A totals row, in the same columns. */
  totals?: Cell[];
  /** What a reader must know to read the table: blanks, groups, sources. */
  notes: string[];
}

/** Chart data; writers draw it with the shared charts (src/report/charts). */
export type ChartSpec =
  | {
      kind: 'impact-by-sector';
      id: string;
      title: string;
      unit: string;
      categories: string[];
      direct: number[];
      indirect: number[];
      induced: number[];
    }
  | {
      kind: 'multipliers-by-sector';
      id: string;
      title: string;
      unit: string;
      categories: string[];
      series: { label: string; values: (number | null)[] }[];
      reference?: number;
    }
  | { kind: 'linkage-quadrant'; id: string; title: string; codes: string[]; labels: string[]; backward: number[]; forward: number[] }
  | { kind: 'tornado'; id: string; title: string; unit: string; base: number; percent: number; items: { label: string; low: number; high: number }[] }
  | { kind: 'percentile-bands'; id: string; title: string; unit: string; categories: string[]; low: number[]; mid: number[]; high: number[]; point: number[] };

export type SectionKind = 'checks' | 'scenario' | 'comparison' | 'multipliers' | 'linkages' | 'tornado' | 'uncertainty' | 'matrix' | 'price' | 'extraction' | 'text' | 'regional' | 'balance';

/** A headline number for the summary. */
export interface Headline {
  label: string;
  value: number | null;
  unit: string;
  style?: NumberStyle;
  note?: string;
}

export interface Section {
  id: string;
  kind: SectionKind;
  title: string;
  /** One line: what the results mean. */
  about: string;
  /** The XLSX sheet the section's tables go to (sections may share one). */
  sheet: string;
  paragraphs: string[];
  tables: ReportTable[];
  charts: ChartSpec[];
  headlines: Headline[];
  /** Cautions particular to this analysis (the general ones are always in the report). */
  cautions: string[];
}

export interface ReportInputFile {
  /** What the file is: `table`, `scenarios`, `make`, `use`, `concordance`, `mapping`... */
  role: string;
  /** The file name as the user gave it (`-` for standard input). */
  name: string;
  /** 64 hexadecimal digits. */
  sha256: string;
  bytes?: number;
  sheet?: string;
}

export type SettingValue = string | number | boolean | null;

export interface ReportSetting {
  key: string;
  label: string;
  value: SettingValue;
  /** Whether the user gave the value, the program guessed it from labels, or it is the default. */
  source: 'given' | 'guessed' | 'default';
  note?: string;
}

export interface TableSummary {
  title: string;
  region?: string;
  year?: number;
  currency?: string;
  scale?: number;
  scaleLabel?: string;
  /** The money unit of every money number: `EUR millions`. */
  moneyUnit: string;
  priceBasis?: string;
  source?: string;
  sectors: number;
  finalDemand: { code: string; label: string }[];
  valueAdded: { code: string; label: string }[];
  satellites: { code: string; label: string; unit: string }[];
  hasImports: boolean;
  invented: boolean;
  notes: string[];
}

export interface ReportFinding {
  severity: Severity;
  code: string;
  message: string;
  where?: string;
}

/** Set when any error finding stands: the table failed its checks, and every writer says so first. */
export interface ReportFailure {
  /** One sentence: the table failed its checks, so its results cannot be trusted. */
  message: string;
  /** The error findings. */
  findings: ReportFinding[];
}

export interface Report {
  format: typeof REPORT_FORMAT;
  version: typeof REPORT_VERSION;
  /** Present when any error finding stands (first in the JSON, first on every report's first page). */
  failed?: ReportFailure;
  title: string;
  subtitle?: string;
  /** ISO 8601 date and time the report was made. */
  createdAt: string;
  tool: { name: string; version: string };
  /** The locale of the numbers shown in HTML (BCP 47, such as `en-GB` or `de-DE`). */
  locale: string;
  /** True when any input is invented data (the demo). */
  invented: boolean;
  table: TableSummary;
  inputs: ReportInputFile[];
  settings: ReportSetting[];
  assumptions: string[];
  cautions: string[];
  findings: ReportFinding[];
  headlines: Headline[];
  sections: Section[];
  notes: string[];
}

export interface ReportParts {
  title: string;
  subtitle?: string;
  /** The table the results come from (or, for results without one, such as supply-use requirements, `tableSummary`). */
  table?: Table;
  tableSummary?: TableSummary;
  tool: { name: string; version: string };
  /** Default: now. */
  createdAt?: string | Date;
  /** Default `en`. */
  locale?: string;
  inputs: ReportInputFile[];
  settings?: ReportSetting[];
  assumptions?: string[];
  /** Findings of the checks and of the analyses. */
  findings?: readonly Finding[];
  sections: Section[];
  notes?: string[];
}

/** A finite number (−0 as 0), or null (blank) for NaN and infinities. */
export function num(v: number | undefined | null): number | null {
  return typeof v === 'number' && Number.isFinite(v) ? (v === 0 ? 0 : v) : null;
}

function nums(v: ArrayLike<number>): (number | null)[] {
  return Array.from(v, (x) => num(x));
}

function finite(v: ArrayLike<number>): number[] {
  return Array.from(v, (x) => (Number.isFinite(x) && x !== 0 ? x : 0));
}

/** What the rounds columns mean. */
const ROUNDS_NOTE = 'First round = c ⊙ (A Δd), what the direct output buys from its suppliers; later rounds (industrial support) = indirect − first round.';

/** The unit of number columns whose rows each state their own unit (in a Unit column). */
const ROW_UNIT = 'unit of the row';

/** The plain summary of a table: what it is, its units and scale, and whether it is invented. */
export function describeTable(t: Table): TableSummary {
  const m = t.meta;
  const s: TableSummary = {
    title: m.title ?? 'Input-output table',
    moneyUnit: moneyUnit(m),
    sectors: t.sectors.codes.length,
    finalDemand: t.finalDemand.codes.map((code, i) => ({ code, label: t.finalDemand.labels[i]! })),
    valueAdded: t.valueAdded.codes.map((code, i) => ({ code, label: t.valueAdded.labels[i]! })),
    satellites: t.satellites.map((x) => ({ code: x.code, label: x.label, unit: x.unit })),
    hasImports: t.imports !== undefined,
    invented: m.invented === true,
    notes: [...(m.notes ?? [])],
  };
  if (m.region !== undefined) s.region = m.region;
  if (m.year !== undefined) s.year = m.year;
  if (m.currency !== undefined) s.currency = m.currency;
  if (m.scale !== undefined) s.scale = m.scale;
  if (m.scaleLabel !== undefined) s.scaleLabel = m.scaleLabel;
  if (m.priceBasis !== undefined) s.priceBasis = m.priceBasis;
  if (m.source !== undefined) s.source = m.source;
  return s;
}

/** The assumptions behind every model-based result of a table, with the household closure if any. */
export function modelAssumptions(t: Table, closure?: HouseholdClosure, options: { typeII?: 'closed' | 'not-found' | 'off' } = {}): string[] {
  const when = [t.meta.year !== undefined ? `of ${t.meta.year}` : '', t.meta.priceBasis ? `at ${t.meta.priceBasis}` : ''].filter(Boolean).join(' ');
  const out = [
    `Technical coefficients A = Z x̂⁻¹ are taken from the table${when ? ` ${when}` : ''} and held fixed; the open model is x = (I − A)⁻¹ d.`,
    `Money is in ${moneyUnit(t.meta)}${t.meta.priceBasis ? `, ${t.meta.priceBasis}` : ''}; other measures are in their own units, stated beside every number.`,
  ];
  if (t.meta.outputAssumed) out.push('The table gives coefficients without outputs: every output is taken as 1, so totals are per unit, not money.');
  if (closure) {
    out.push(
      `Type II (induced) effects close the model for households: labour income is the value-added row${closure.incomeRows.length > 1 ? 's' : ''} ${closure.incomeRows.map((c) => `'${c}'`).join(', ')} and household spending follows the final-demand column '${closure.consumptionColumn}'.`,
      closureLine(conventions({ table: t, closure }).closure),
    );
  } else {
    out.push(closureLine(conventions({ table: t }, [], options.typeII === 'not-found' ? { typeII: 'not-found' } : {}).closure));
  }
  out.push('Demand changes enter the model at their local share: only the part bought from producers inside the economy sets off the supply chain.');
  return out;
}

/** A setting as a report states it. */
export function setting(key: string, label: string, value: SettingValue, source: ReportSetting['source'] = 'given', note?: string): ReportSetting {
  const s: ReportSetting = { key, label, value, source };
  if (note !== undefined) s.note = note;
  return s;
}

function section(p: Partial<Section> & Pick<Section, 'id' | 'kind' | 'title' | 'about' | 'sheet'>): Section {
  return { paragraphs: [], tables: [], charts: [], headlines: [], cautions: [], ...p };
}

const CODE: Column = { key: 'code', label: 'Code', type: 'text' };
const SECTOR: Column = { key: 'sector', label: 'Sector', type: 'text' };

function numberColumn(key: string, label: string, unit: string, style: NumberStyle): Column {
  return { key, label, type: 'number', unit, style };
}

/** The findings of the checks as a section: one row per finding, errors first. */
export function checksSection(findings: readonly Finding[], options: { condition?: number } = {}): Section {
  const sorted = sortFindings(findings);
  const count = (s: Severity) => sorted.filter((f) => f.severity === s).length;
  const para = [`${count('error')} error${count('error') === 1 ? '' : 's'}, ${count('warning')} warning${count('warning') === 1 ? '' : 's'} and ${count('note')} note${count('note') === 1 ? '' : 's'}.`];
  if (options.condition !== undefined && Number.isFinite(options.condition)) para.push(`The 1-norm condition estimate of I − A is ${options.condition.toPrecision(4)}.`);
  return section({
    id: 'checks',
    kind: 'checks',
    title: 'Checks of the table',
    about: 'What the checks of the table found: balances, productivity, singularity and conditioning. An error means results from this table cannot be trusted.',
    sheet: 'Checks',
    paragraphs: para,
    tables: [
      {
        id: 'checks',
        title: 'Findings',
        columns: [
          { key: 'severity', label: 'Severity', type: 'text' },
          { key: 'code', label: 'Code', type: 'text' },
          { key: 'message', label: 'Finding', type: 'text' },
          { key: 'where', label: 'Where', type: 'text' },
        ],
        rows: sorted.map((f) => [f.severity, f.code, f.message, f.where ? describeWhere(f.where) || null : null]),
        notes: sorted.length ? [] : ['The checks found nothing to report.'],
      },
    ],
  });
}

export interface ScenarioSectionOptions {
  /** Position of the scenario in the report, from 1 (for identifiers). */
  index?: number;
  /** Measure codes to chart (default: output, and jobs when present). */
  chart?: string[];
}

/**
 * One scenario: its demand changes, its impact by measure (direct, indirect, induced, total),
 * the impact by sector for every measure, and stacked bars by sector.
 */
export function scenarioSection(scenario: ResolvedScenario, impact: Impact, options: ScenarioSectionOptions = {}): Section {
  const k = options.index ?? 1;
  const id = `scenario-${k}`;
  const sectors = impact.sectors;
  const money = impact.moneyUnit;
  const rounds = impact.measures.some((m) => m.firstRound !== undefined);
  const paragraphs: string[] = [];
  if (scenario.description) paragraphs.push(scenario.description);
  paragraphs.push(
    `The demand changes add up to ${fmtPlain(scenario.totalGross)} ${money}, of which ${fmtPlain(scenario.totalLocal)} ${money} is bought from producers in the economy and enters the model.`,
  );
  if (!impact.closed) paragraphs.push('The model is not closed for households: induced effects are zero.');
  const changes: ReportTable = {
    id: `${id}-changes`,
    title: `Demand changes: ${scenario.name}`,
    columns: [
      { key: 'position', label: 'Change', type: 'number', unit: 'position', style: 'count' },
      CODE,
      SECTOR,
      { key: 'category', label: 'Final-demand category', type: 'text' },
      numberColumn('amount', 'Change in final demand', money, 'amount'),
      numberColumn('localShare', 'Local share', 'fraction', 'ratio'),
      numberColumn('local', 'Local change (enters the model)', money, 'amount'),
    ],
    rows: scenario.changes.map((c) => [c.position, c.sector, sectors.labels[c.sectorIndex] ?? c.sector, c.category ?? null, c.amount, c.localShare, c.local]),
    totals: ['Total', null, null, null, scenario.totalGross, null, scenario.totalLocal],
    notes: [],
  };
  const totals: ReportTable = {
    id: `${id}-totals`,
    title: `Impact by measure: ${scenario.name}`,
    about: IMPACT_ABOUT,
    columns: [
      { key: 'measure', label: 'Measure', type: 'text' },
      { key: 'unit', label: 'Unit', type: 'text' },
      { key: 'direct', label: 'Direct', type: 'number', unit: ROW_UNIT, style: 'amount' },
      { key: 'indirect', label: 'Indirect', type: 'number', unit: ROW_UNIT, style: 'amount' },
      ...(rounds
        ? [
            { key: 'firstRound', label: 'First round (A Δd)', type: 'number' as const, unit: ROW_UNIT, style: 'amount' as const },
            { key: 'laterRounds', label: 'Later rounds (industrial support)', type: 'number' as const, unit: ROW_UNIT, style: 'amount' as const },
          ]
        : []),
      { key: 'induced', label: 'Induced', type: 'number', unit: ROW_UNIT, style: 'amount' },
      { key: 'total', label: 'Total', type: 'number', unit: ROW_UNIT, style: 'amount' },
    ],
    rows: impact.measures.map((m) => [m.measure.label, m.unit, num(m.totals.direct), num(m.totals.indirect), ...(rounds ? [num(m.totals.firstRound), num(m.totals.laterRounds)] : []), num(m.totals.induced), num(m.totals.total)]),
    notes: ['Each row is in the unit given in its Unit column.', ...(rounds ? [ROUNDS_NOTE] : [])],
  };
  const bySector: ReportTable[] = impact.measures.map((m) => ({
    id: `${id}-${m.measure.code}`,
    title: `${m.measure.label} by sector: ${scenario.name}`,
    about: `Where the effect on ${m.measure.label.toLowerCase()} happens, by sector, in ${m.unit}.`,
    columns: [
      CODE,
      SECTOR,
      numberColumn('direct', 'Direct', m.unit, 'amount'),
      numberColumn('indirect', 'Indirect', m.unit, 'amount'),
      ...(rounds ? [numberColumn('firstRound', 'First round (A Δd)', m.unit, 'amount'), numberColumn('laterRounds', 'Later rounds (industrial support)', m.unit, 'amount')] : []),
      numberColumn('induced', 'Induced', m.unit, 'amount'),
      numberColumn('total', 'Total', m.unit, 'amount'),
    ],
    rows: sectors.codes.map((c, i) => [c, sectors.labels[i]!, num(m.direct[i]!), num(m.indirect[i]!), ...(rounds ? [num(m.firstRound?.[i]), num(m.laterRounds?.[i])] : []), num(m.induced[i]!), num(m.total[i]!)]),
    totals: ['Total', null, num(m.totals.direct), num(m.totals.indirect), ...(rounds ? [num(m.totals.firstRound), num(m.totals.laterRounds)] : []), num(m.totals.induced), num(m.totals.total)],
    notes: rounds ? [ROUNDS_NOTE] : [],
  }));
  const chartCodes = options.chart ?? impact.measures.filter((m) => m.measure.kind === 'output' || m.measure.kind === 'jobs').map((m) => m.measure.code);
  const charts: ChartSpec[] = impact.measures
    .filter((m) => chartCodes.includes(m.measure.code))
    .map((m) => ({
      kind: 'impact-by-sector' as const,
      id: `${id}-${m.measure.code}-chart`,
      title: `${m.measure.label}: impact by sector, ${scenario.name}`,
      unit: m.unit,
      categories: [...sectors.labels],
      direct: finite(m.direct),
      indirect: finite(m.indirect),
      induced: finite(m.induced),
    }));
  const headlines: Headline[] = impact.measures.map((m) => ({ label: `${scenario.name}: ${m.measure.label.toLowerCase()}, total effect`, value: num(m.totals.total), unit: m.unit, style: 'amount' }));
  const cautions: string[] = [];
  if (impact.findings.length) cautions.push(...impact.findings.map((f) => f.message));
  return section({
    id,
    kind: 'scenario',
    title: `Scenario: ${scenario.name}`,
    about: IMPACT_ABOUT,
    sheet: 'Impacts',
    paragraphs,
    tables: [changes, totals, ...bySector],
    charts,
    headlines,
    cautions,
  });
}

/** Several scenarios side by side: the total effect on every measure. */
export function comparisonSection(impacts: readonly Impact[]): Section {
  const rows: Cell[][] = [];
  for (const im of impacts) for (const m of im.measures) rows.push([im.scenario, m.measure.label, m.unit, num(m.totals.direct), num(m.totals.indirect), num(m.totals.induced), num(m.totals.total)]);
  return section({
    id: 'comparison',
    kind: 'comparison',
    title: 'Scenarios compared',
    about: 'The total effect of each scenario on each measure, split into direct, indirect and induced.',
    sheet: 'Summary',
    tables: [
      {
        id: 'comparison',
        title: 'Total effects by scenario and measure',
        columns: [
          { key: 'scenario', label: 'Scenario', type: 'text' },
          { key: 'measure', label: 'Measure', type: 'text' },
          { key: 'unit', label: 'Unit', type: 'text' },
          { key: 'direct', label: 'Direct', type: 'number', unit: ROW_UNIT, style: 'amount' },
          { key: 'indirect', label: 'Indirect', type: 'number', unit: ROW_UNIT, style: 'amount' },
          { key: 'induced', label: 'Induced', type: 'number', unit: ROW_UNIT, style: 'amount' },
          { key: 'total', label: 'Total', type: 'number', unit: ROW_UNIT, style: 'amount' },
        ],
        rows,
        notes: ['Each row is in the unit given in its Unit column.'],
      },
    ],
  });
}

/**
 * Multipliers of every measure: direct, indirect, simple (Type I model), induced and total
 * (Type II model), Type I and Type II ratios. Ratios that are not defined are blank, with a note.
 */
export function multipliersSection(list: readonly Multipliers[], options: { chart?: string[] } = {}): Section {
  const tables: ReportTable[] = list.map((m) => {
    const closed = m.total !== undefined;
    const u = m.unit;
    const columns: Column[] = [
      CODE,
      SECTOR,
      numberColumn('direct', 'Direct', u, 'multiplier'),
      numberColumn('indirect', 'Indirect', u, 'multiplier'),
    ];
    const rounds = m.firstRound !== undefined && m.laterRounds !== undefined;
    if (rounds) columns.push(numberColumn('firstRound', 'First round (c′A)', u, 'multiplier'), numberColumn('laterRounds', 'Later rounds (industrial support)', u, 'multiplier'));
    columns.push(numberColumn('simple', 'Simple (direct + indirect)', u, 'multiplier'));
    if (closed) columns.push(numberColumn('induced', 'Induced', u, 'multiplier'), numberColumn('total', 'Total (with induced)', u, 'multiplier'));
    columns.push(numberColumn('typeI', 'Type I', 'ratio', 'ratio'));
    if (closed) columns.push(numberColumn('typeII', 'Type II', 'ratio', 'ratio'));
    const rows: Cell[][] = m.sectors.codes.map((c, j) => {
      const r: Cell[] = [c, m.sectors.labels[j]!, num(m.direct[j]!), num(m.indirect[j]!)];
      if (rounds) r.push(num(m.firstRound![j]!), num(m.laterRounds![j]!));
      r.push(num(m.simple[j]!));
      if (closed) r.push(num(m.induced![j]!), num(m.total![j]!));
      r.push(num(m.typeI[j]!));
      if (closed) r.push(num(m.typeII![j]!));
      return r;
    });
    const notes: string[] = [];
    const none = m.sectors.codes.filter((_, j) => !Number.isFinite(m.simple[j]!));
    if (none.length) notes.push(`Every figure is blank for ${none.length} sector${none.length > 1 ? 's' : ''} with no output (${none.slice(0, 12).join(', ')}${none.length > 12 ? ', …' : ''}): without output there are no coefficients to multiply.`);
    const zero = m.sectors.codes.filter((_, j) => !Number.isFinite(m.typeI[j]!) && Number.isFinite(m.simple[j]!));
    if (zero.length) {
      notes.push(
        `Type I${closed ? ' and Type II are' : ' is'} blank for ${zero.length} sector${zero.length > 1 ? 's' : ''} with no direct ${m.measure.label.toLowerCase()} (${zero.slice(0, 12).join(', ')}${zero.length > 12 ? ', …' : ''}): a ratio to a zero direct effect is not defined.`,
      );
    }
    if (!closed) notes.push('No household closure: induced, total and Type II multipliers are not computed.');
    notes.push('Total sums the n sectors of the closed model; the household row is not counted. Induced = total − simple.');
    if (rounds) notes.push('First round = c′A (for output, the column sums of A); later rounds (industrial support) = indirect − first round.');
    return {
      id: `multipliers-${m.measure.code}`,
      title: `${m.measure.label} multipliers`,
      about: `The effect on ${m.measure.label.toLowerCase()} of one more unit of final demand for each sector, in ${u}; Type I and Type II are ratios to the direct effect.`,
      columns,
      rows,
      notes,
    };
  });
  const chartCodes = options.chart ?? ['output'];
  const charts: ChartSpec[] = list
    .filter((m) => chartCodes.includes(m.measure.code))
    .map((m) => {
      const series: { label: string; values: (number | null)[] }[] = [{ label: 'Simple (Type I model)', values: nums(m.simple) }];
      if (m.total) series.push({ label: 'Total (Type II model)', values: nums(m.total) });
      return { kind: 'multipliers-by-sector' as const, id: `multipliers-${m.measure.code}-chart`, title: `${m.measure.label} multipliers by sector`, unit: m.unit, categories: [...m.sectors.labels], series, reference: m.measure.kind === 'output' ? 1 : undefined };
    });
  return section({ id: 'multipliers', kind: 'multipliers', title: 'Multipliers', about: MULTIPLIERS_ABOUT, sheet: 'Multipliers', tables, charts });
}

/** Linkages and key sectors, with the quadrant chart. */
export function linkagesSection(l: Linkages): Section {
  const columns: Column[] = [
    CODE,
    SECTOR,
    numberColumn('directBackward', 'Direct backward (column sum of A)', 'per unit of output', 'multiplier'),
    numberColumn('directForward', 'Direct forward (row sum of B)', 'per unit of output', 'multiplier'),
    numberColumn('totalBackward', 'Total backward (column sum of L)', 'per unit of final demand', 'multiplier'),
    numberColumn('totalForward', 'Total forward (row sum of G)', 'per unit of primary input', 'multiplier'),
    numberColumn('power', 'Backward index (power of dispersion)', 'index, mean 1', 'index'),
    numberColumn('sensitivity', 'Forward index (sensitivity of dispersion)', 'index, mean 1', 'index'),
  ];
  if (l.variationBackward) columns.push(numberColumn('variationBackward', 'Variation of backward pull', 'coefficient of variation', 'ratio'), numberColumn('variationForward', 'Variation of forward push', 'coefficient of variation', 'ratio'));
  columns.push({ key: 'group', label: 'Group', type: 'text' });
  const rows: Cell[][] = l.sectors.codes.map((c, j) => {
    const r: Cell[] = [c, l.sectors.labels[j]!, num(l.directBackward[j]!), num(l.directForward[j]!), num(l.totalBackward[j]!), num(l.totalForward[j]!), num(l.power[j]!), num(l.sensitivity[j]!)];
    if (l.variationBackward) r.push(num(l.variationBackward[j]!), num(l.variationForward![j]!));
    r.push(l.group[j]!);
    return r;
  });
  const groups = (Object.keys(KEY_SECTOR_GROUPS) as (keyof typeof KEY_SECTOR_GROUPS)[])
    .filter((g) => g !== 'no-output' || l.groups[g].length)
    .map((g) => `${g}: ${KEY_SECTOR_GROUPS[g]} (${l.groups[g].length ? l.groups[g].join(', ') : 'none'}).`);
  groups.push(DEFINITIONS.linkageBases, DEFINITIONS.normalisation, DEFINITIONS.keySectorRule, DEFINITIONS.variation);
  const live = l.group.flatMap((g, j) => (g === 'no-output' ? [] : [j]));
  return section({
    id: 'linkages',
    kind: 'linkages',
    title: 'Linkages and key sectors',
    about: LINKAGES_ABOUT,
    sheet: 'Linkages',
    paragraphs: groups,
    tables: [{ id: 'linkages', title: 'Linkages by sector', about: LINKAGES_ABOUT, columns, rows, notes: l.findings.map((f) => f.message) }],
    charts: [{ kind: 'linkage-quadrant', id: 'linkages-chart', title: 'Key sectors: backward and forward linkage', codes: live.map((j) => l.sectors.codes[j]!), labels: live.map((j) => l.sectors.labels[j]!), backward: finite(live.map((j) => l.power[j]!)), forward: finite(live.map((j) => l.sensitivity[j]!)) }],
  });
}

export interface TornadoSectionInput {
  data: TornadoData;
  /** The sectors of the model (rows and columns of A). */
  sectors: Axis;
  /** What the result is: `Output multiplier of FOOD`, `Total output impact of 'New plant'`. */
  target: string;
  unit: string;
}

/** The sensitivity tornado: the result at the low and high value of its most influential coefficients. */
export function tornadoSection(input: TornadoSectionInput): Section {
  const { data, sectors } = input;
  const name = (i: number) => sectors.codes[i] ?? String(i + 1);
  const rows: Cell[][] = data.bars.map((b) => [
    name(b.row),
    name(b.col),
    b.coefficient,
    b.low.coefficient,
    b.low.result === 'none' ? null : b.low.result,
    b.high.coefficient,
    b.high.result === 'none' ? null : b.high.result,
    b.range === 'none' ? null : b.range,
  ]);
  const notes = [`Each coefficient is moved by ±${data.percent} % alone, every other coefficient held fixed; the base result is ${fmtPlain(data.value)} ${input.unit}.`];
  if (data.bars.some((b) => b.range === 'none')) notes.push('A blank result means the change takes the model past its productivity boundary (no finite solution).');
  const items = data.bars
    .filter((b) => b.low.result !== 'none' && b.high.result !== 'none')
    .map((b) => ({ label: `${name(b.row)} → ${name(b.col)}`, low: b.low.result as number, high: b.high.result as number }));
  return section({
    id: 'tornado',
    kind: 'tornado',
    title: `Sensitivity: ${input.target}`,
    about: data.about,
    sheet: 'Sensitivity',
    paragraphs: [`The coefficients whose error would move ${lowerFirst(input.target)} most. Row sector supplies, column sector buys.`],
    tables: [
      {
        id: 'tornado',
        title: `Most influential coefficients: ${input.target}`,
        columns: [
          { key: 'row', label: 'Supplying sector (row)', type: 'text' },
          { key: 'col', label: 'Buying sector (column)', type: 'text' },
          numberColumn('coefficient', 'Coefficient', 'per unit of output', 'coefficient'),
          numberColumn('lowCoefficient', 'Low coefficient', 'per unit of output', 'coefficient'),
          numberColumn('low', 'Result at low', input.unit, 'multiplier'),
          numberColumn('highCoefficient', 'High coefficient', 'per unit of output', 'coefficient'),
          numberColumn('high', 'Result at high', input.unit, 'multiplier'),
          numberColumn('range', 'Range', input.unit, 'multiplier'),
        ],
        rows,
        notes,
      },
    ],
    charts: [{ kind: 'tornado', id: 'tornado-chart', title: `Sensitivity of ${lowerFirst(input.target)}`, unit: input.unit, base: data.value, percent: data.percent, items }],
    // The general cautions (fixed coefficients, review) are in every report already.
    cautions: SENSITIVITY_CAUTIONS.filter((c) => !/qualified economist|fixed coefficients/i.test(c)),
  });
}

export interface UncertaintySectionInput {
  result: MonteCarloResult;
  sectors: Axis;
  /** Per measure of the run (same order): the unit of its multipliers and of its impacts. */
  units: { multiplier: string; impact: string }[];
  /** The coefficient of variation, as a ratio. */
  cv: number;
}

/** Monte Carlo on the coefficients: percentiles of each measure's multipliers by sector, and of each scenario's totals. */
export function uncertaintySection(input: UncertaintySectionInput): Section {
  const { result: r, sectors } = input;
  const label = (code: string) => sectors.labels[sectors.codes.indexOf(code)] ?? code;
  const cols = (unit: string, style: NumberStyle): Column[] => [
    numberColumn('point', 'Table value', unit, style),
    numberColumn('mean', 'Mean', unit, style),
    numberColumn('sd', 'Standard deviation', unit, style),
    numberColumn('p5', '5th percentile', unit, style),
    numberColumn('p50', 'Median', unit, style),
    numberColumn('p95', '95th percentile', unit, style),
  ];
  const cells = (x: Summary): Cell[] => [num(x.point), num(x.mean), num(x.sd), num(x.p5), num(x.p50), num(x.p95)];
  const tables: ReportTable[] = [];
  const charts: ChartSpec[] = [];
  r.multipliers.forEach((m, k) => {
    const meta = r.measures[k]!;
    const unit = input.units[k]!.multiplier;
    tables.push({
      id: `uncertainty-${meta.code}`,
      title: `${meta.label ?? meta.code} multipliers across the draws`,
      about: 'Simple multipliers of the open model, one per sector, from the accepted draws.',
      columns: [CODE, SECTOR, ...cols(unit, 'multiplier')],
      rows: r.sectors.map((code, j) => [code, label(code), ...cells(m.bySector[j]!)]),
      notes: [],
    });
    charts.push({
      kind: 'percentile-bands',
      id: `uncertainty-${meta.code}-chart`,
      title: `${meta.label ?? meta.code} multipliers: 5th to 95th percentile of ${r.accepted} draws`,
      unit,
      categories: r.sectors.map(label),
      low: m.bySector.map((x) => x.p5),
      mid: m.bySector.map((x) => x.p50),
      high: m.bySector.map((x) => x.p95),
      point: m.bySector.map((x) => x.point),
    });
  });
  if (r.scenarios.length) {
    tables.push({
      id: 'uncertainty-scenarios',
      title: 'Scenario totals across the draws',
      about: 'The total impact of each scenario on each measure (open model: direct and indirect).',
      columns: [{ key: 'scenario', label: 'Scenario', type: 'text' }, { key: 'measure', label: 'Measure', type: 'text' }, { key: 'unit', label: 'Unit', type: 'text' }, ...cols('as given', 'amount')],
      rows: r.scenarios.flatMap((sc) => sc.measures.map((m, k) => [sc.label, r.measures[k]!.label ?? m.measure, input.units[k]!.impact, ...cells(m.total)])),
      notes: ['Each row is in the unit given in its Unit column.'],
    });
  }
  const rejected = r.rejected.total;
  return section({
    id: 'uncertainty',
    kind: 'uncertainty',
    title: 'Uncertainty: Monte Carlo on the technical coefficients',
    about: r.about,
    sheet: 'Uncertainty',
    paragraphs: [
      `${r.errorModel} ${r.accepted} of ${r.draws} draws were accepted (seed ${r.seed}); ${rejected} broke productivity and were left out${rejected ? ` (${Object.entries(r.rejected.byReason).filter(([, n]) => n > 0).map(([why, n]) => `${n} ${why}`).join(', ')})` : ''}.`,
    ],
    tables,
    charts,
    cautions: UNCERTAINTY_CAUTIONS.filter((c) => !/qualified economist|fixed coefficients/i.test(c)),
  });
}

export interface MatrixSectionInput {
  id: string;
  title: string;
  about: string;
  rows: Axis;
  cols: Axis;
  matrix: Matrix;
  unit: string;
  style?: NumberStyle;
  sheet?: string;
  /** Label of the top-left cell (what the rows are). */
  corner?: string;
}

/** A matrix (coefficients, total requirements) as a table with codes, labels and one column per code. */
export function matrixSection(input: MatrixSectionInput): Section {
  const { rows, cols, matrix } = input;
  const style = input.style ?? 'coefficient';
  const columns: Column[] = [
    { key: 'code', label: input.corner ?? 'Code', type: 'text' },
    { key: 'label', label: 'Title', type: 'text' },
    ...cols.codes.map((c): Column => ({ key: `c:${c}`, label: c, type: 'number', unit: input.unit, style })),
  ];
  const out: Cell[][] = rows.codes.map((c, i) => [c, rows.labels[i] ?? c, ...nums(matrix.data.subarray(i * matrix.cols, (i + 1) * matrix.cols))]);
  return section({
    id: input.id,
    kind: 'matrix',
    title: input.title,
    about: input.about,
    sheet: input.sheet ?? 'Matrix',
    tables: [{ id: input.id, title: input.title, about: input.about, columns, rows: out, notes: [`Every number is in ${input.unit}. Columns are headed by their codes; the titles are in the column of the same code among the rows.`] }],
  });
}

/** The Leontief price model: base indices, the change and the percentage rise by sector. */
export function priceSection(p: PriceResult, options: { shock?: string } = {}): Section {
  return section({
    id: 'price',
    kind: 'price',
    title: 'Prices: cost push',
    about: PRICE_ABOUT,
    sheet: 'Prices',
    paragraphs: options.shock ? [`Shock: ${options.shock}.`] : [],
    tables: [
      {
        id: 'price',
        title: 'Price indices by sector',
        columns: [
          CODE,
          SECTOR,
          numberColumn('costChange', 'Change in primary cost', 'per unit of output', 'coefficient'),
          numberColumn('base', 'Base index', 'index, 1 in the table year', 'index'),
          numberColumn('change', 'Change', 'index points', 'index'),
          numberColumn('index', 'New index', 'index, 1 in the table year', 'index'),
          numberColumn('percent', 'Rise', '%', 'percent'),
        ],
        rows: p.sectors.codes.map((c, j) => [c, p.sectors.labels[j]!, num(p.costChange[j]!), num(p.base[j]!), num(p.change[j]!), num(p.index[j]!), num(p.percent[j]!)]),
        notes: p.findings.map((f) => f.message),
      },
    ],
    cautions: ['The price model passes costs on in full and holds quantities and margins fixed: it says nothing about demand falling as prices rise.'],
  });
}

/** Hypothetical extraction of one sector or a group. */
export function extractionSection(e: Extraction): Section {
  const u = e.unit;
  const rows: Cell[][] = e.sectors.codes.map((c, i) => [c, e.sectors.labels[i]!, num(e.baseline[i]!), num(e.total.lossBySector[i]!), num(e.backward.lossBySector[i]!), num(e.forward.lossBySector[i]!)]);
  return section({
    id: 'extraction',
    kind: 'extraction',
    title: `Hypothetical extraction of ${e.extracted.join(', ')}`,
    about: EXTRACTION_ABOUT,
    sheet: 'Extraction',
    paragraphs: [
      `Total output lost: ${fmtPlain(e.total.loss)} ${u} (${fmtPlain(e.total.lossPercent)} %) without the sector${e.extracted.length > 1 ? 's' : ''}; ${fmtPlain(e.backward.loss)} ${u} (${fmtPlain(e.backward.lossPercent)} %) without ${e.extracted.length > 1 ? 'their' : 'its'} purchases; ${fmtPlain(e.forward.loss)} ${u} (${fmtPlain(e.forward.lossPercent)} %) without ${e.extracted.length > 1 ? 'their' : 'its'} sales to other sectors.`,
    ],
    tables: [
      {
        id: 'extraction',
        title: 'Output lost by sector',
        columns: [CODE, SECTOR, numberColumn('baseline', 'Output in the table', u, 'amount'), numberColumn('total', 'Lost: total extraction', u, 'amount'), numberColumn('backward', 'Lost: backward only', u, 'amount'), numberColumn('forward', 'Lost: forward only', u, 'amount')],
        rows,
        totals: ['Total', null, num(e.baselineTotal), num(e.total.loss), num(e.backward.loss), num(e.forward.loss)],
        notes: [],
      },
    ],
    headlines: [{ label: `Total output lost without ${e.extracted.join(', ')}`, value: num(e.total.loss), unit: u, style: 'amount' }],
    cautions: [GHOSH_CAUTION],
  });
}

/** Every sector extracted in turn, ranked by the total loss. */
export function extractionRankingSection(r: ExtractionRanking): Section {
  const u = r.unit;
  const order = r.sectors.codes.map((_, i) => i).sort((a, b) => r.total[b]! - r.total[a]!);
  return section({
    id: 'extraction',
    kind: 'extraction',
    title: 'Hypothetical extraction of each sector',
    about: EXTRACTION_RANKING_ABOUT,
    sheet: 'Extraction',
    paragraphs: [`Total output in the table: ${fmtPlain(r.baselineTotal)} ${u}. Sectors are ranked by the loss under total extraction.`],
    tables: [
      {
        id: 'extraction-ranking',
        title: 'Output lost when each sector is extracted',
        columns: [
          CODE,
          SECTOR,
          numberColumn('total', 'Total extraction', u, 'amount'),
          numberColumn('totalPercent', 'Total extraction', '% of total output', 'percent'),
          numberColumn('backward', 'Backward only', u, 'amount'),
          numberColumn('backwardPercent', 'Backward only', '% of total output', 'percent'),
          numberColumn('forward', 'Forward only', u, 'amount'),
          numberColumn('forwardPercent', 'Forward only', '% of total output', 'percent'),
        ],
        rows: order.map((i) => [r.sectors.codes[i]!, r.sectors.labels[i]!, num(r.total[i]!), num(r.totalPercent[i]!), num(r.backward[i]!), num(r.backwardPercent[i]!), num(r.forward[i]!), num(r.forwardPercent[i]!)]),
        notes: [],
      },
    ],
    cautions: [GHOSH_CAUTION],
  });
}

/** A section of text only (notes, a method statement). */
export function textSection(id: string, title: string, about: string, paragraphs: string[], sheet = 'Notes'): Section {
  return section({ id, kind: 'text', title, about, sheet, paragraphs });
}

/** Put the parts together: cautions gathered (general first), identifiers checked, headlines collected. */
export function buildReport(p: ReportParts): Report {
  const ids = new Set<string>();
  for (const s of p.sections) {
    for (const t of s.tables) {
      if (ids.has(t.id)) throw new Error(`report: two tables have the identifier '${t.id}'`);
      ids.add(t.id);
      for (const [r, row] of t.rows.entries()) {
        if (row.length !== t.columns.length) throw new Error(`report: table '${t.id}' row ${r + 1} has ${row.length} cells for ${t.columns.length} columns`);
      }
    }
  }
  const cautions: string[] = [];
  const add = (c: string) => {
    if (!cautions.includes(c)) cautions.push(c);
  };
  CAUTIONS.forEach(add);
  add('Local guidance first: where a public body publishes guidance on economic impact assessment, follow it before these figures.');
  for (const s of p.sections) s.cautions.forEach(add);
  if (!p.table && !p.tableSummary) throw new Error('report: give the table or its summary');
  const summary = p.tableSummary ?? describeTable(p.table!);
  const invented = summary.invented;
  const created = p.createdAt === undefined ? new Date() : p.createdAt;
  const notes = [...(p.notes ?? [])];
  if (invented) notes.unshift('INVENTED DATA: the table in this report is invented for demonstration. Do not use any number in it for a decision.');
  const r: Report = {
    format: REPORT_FORMAT,
    version: REPORT_VERSION,
    title: p.title,
    createdAt: typeof created === 'string' ? created : created.toISOString(),
    tool: { ...p.tool },
    locale: p.locale ?? 'en',
    invented,
    table: summary,
    inputs: p.inputs.map((x) => ({ ...x })),
    settings: (p.settings ?? []).map((x) => ({ ...x })),
    assumptions: [...(p.assumptions ?? [])],
    cautions,
    findings: sortFindings(p.findings ?? []).map((f) => {
      const out: ReportFinding = { severity: f.severity, code: f.code, message: f.message };
      const w = f.where ? describeWhere(f.where) : '';
      if (w) out.where = w;
      return out;
    }),
    headlines: p.sections.flatMap((s) => s.headlines),
    sections: p.sections,
    notes,
  };
  if (p.subtitle !== undefined) r.subtitle = p.subtitle;
  const errors = r.findings.filter((f) => f.severity === 'error');
  if (!errors.length) return r;
  const failed: ReportFailure = {
    message: `THE TABLE FAILED ${errors.length} CHECK${errors.length > 1 ? 'S' : ''}: results computed from it cannot be trusted. Fix the table (or the options) and make the report again before using any number in it.`,
    findings: errors.map((f) => ({ ...f })),
  };
  const { format, version, ...rest } = r;
  return { format, version, failed, ...rest };
}

/** The failure lines of a report, one per error finding after the headline (empty when it did not fail). */
export function failureLines(r: Pick<Report, 'failed'>): string[] {
  if (!r.failed) return [];
  return [r.failed.message, ...r.failed.findings.map((f) => `Error ${f.code}: ${f.message}${f.where ? ` (${f.where})` : ''}`)];
}

/** Every table of a report, in order (for writers and tests). */
export function reportTables(r: Report): ReportTable[] {
  return r.sections.flatMap((s) => s.tables);
}

/** The first letter in lower case, for a name inside a sentence (the rest, such as a scenario's name, kept). */
function lowerFirst(s: string): string {
  return /^[A-Z][a-z]/.test(s) ? s[0]!.toLowerCase() + s.slice(1) : s;
}

/** A number in plain words for a sentence (no locale: sentences are in the model as text). */
function fmtPlain(v: number): string {
  if (!Number.isFinite(v)) return 'not defined';
  const a = Math.abs(v);
  const digits = a >= 100 ? 1 : a >= 1 ? 2 : 4;
  return v.toFixed(digits);
}
