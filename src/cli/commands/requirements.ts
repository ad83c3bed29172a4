/**
 * `ripplewise requirements --make FILE --use FILE --kind KIND --out FILE.csv`: supply-use (make
 * and use) tables to direct or total requirements, written as a wide matrix (codes in the first
 * column and in the header row). A stable contract that scripts rely on (see README.md).
 */
import { InputError } from '../../../engine/errors';
import { sortFindings } from '../../../engine/findings';
import type { RequirementsKind, Technology } from '../../../engine/supply-use';
import { REQUIREMENTS_KINDS, supplyUse } from '../../../engine/supply-use';
import type { TableSummary } from '../../report/model';
import { buildReport, checksSection, matrixSection, setting } from '../../report/model';
import type { CommonFlags } from '../common';
import { numberOption, reportBase } from '../common';
import type { CliContext } from '../context';
import { styles } from '../context';
import { UsageError } from '../errors';
import { reportInput } from '../files';
import type { LabelledMatrix } from '../matrix-out';
import { matrixJson, matrixWriters } from '../matrix-out';
import { list } from '../model-options';
import { deliver, planOutputs } from '../output';
import { progress } from '../progress';
import { loadSupplyUse } from '../supply-use-input';
import { blanksOption, loadLabels, numberOptions, selectOption } from '../table-input';
import { CAUTION_LINE, findingsText } from '../text';
import { FORMATS } from '../register/requirements';

export interface Flags extends CommonFlags {
  make?: string;
  use?: string;
  kind?: string;
  scrap?: string;
  labels?: string;
  technology?: string;
  valueAdded?: string;
  finalDemand?: string;
  ignore?: string;
  makeSheet?: string;
  useSheet?: string;
  makeValueColumn?: string;
  useValueColumn?: string;
  blanks?: string;
  zeroText?: string[];
  decimal?: string;
  thousands?: string;
  select?: string[];
}

export const KIND_TEXT: Record<RequirementsKind, { title: string; about: string; corner: string }> = {
  direct: { title: 'Direct requirements (commodity by industry)', about: 'Each commodity (row) an industry (column) buys per unit of its output: B = U ĝ⁻¹.', corner: 'commodity/industry' },
  'commodity-by-commodity': { title: 'Total requirements, commodity by commodity', about: 'The output of each commodity (row), direct and indirect, per unit of final demand for each commodity (column).', corner: 'commodity/commodity' },
  'industry-by-commodity': { title: 'Total requirements, industry by commodity', about: 'The output of each industry (row), direct and indirect, per unit of final demand for each commodity (column).', corner: 'industry/commodity' },
  'industry-by-industry': { title: 'Total requirements, industry by industry', about: 'The output of each industry (row), direct and indirect, per unit of final demand for the output of each industry (column).', corner: 'industry/industry' },
};

export async function action(ctx: CliContext, f: Flags): Promise<number> {
  const kind = f.kind as RequirementsKind;
  if (!REQUIREMENTS_KINDS.includes(kind)) throw new UsageError(`--kind ${f.kind} is not known; choose one of ${REQUIREMENTS_KINDS.join(', ')}`, 'bad-kind');
  if (f.technology !== undefined && f.technology !== 'industry' && f.technology !== 'commodity') throw new UsageError(`--technology must be industry or commodity; got '${f.technology}'`, 'bad-technology');
  const makeValue = numberOption(f.makeValueColumn, '--make-value-column', { min: 1, integer: true });
  const useValue = numberOption(f.useValueColumn, '--use-value-column', { min: 1, integer: true });
  const blanks = blanksOption(f.blanks);
  const plan = planOutputs(f, FORMATS);
  const { labels } = await loadLabels(ctx, f.labels);
  const bar = await progress(ctx, 'requirements', 3, f);
  let loaded;
  try {
    bar.step('reading the make and use tables');
    loaded = await loadSupplyUse(
      ctx,
      f.make!,
      f.use!,
      { make: { ...(f.makeSheet !== undefined ? { sheet: f.makeSheet } : {}), ...(makeValue !== undefined ? { valueColumn: makeValue } : {}) }, use: { ...(f.useSheet !== undefined ? { sheet: f.useSheet } : {}), ...(useValue !== undefined ? { valueColumn: useValue } : {}) } },
      {
        ...(f.scrap !== undefined ? { scrap: f.scrap } : {}),
        ...(labels ? { labels } : {}),
        ...(f.technology ? { technology: f.technology as Technology } : {}),
        ...(f.valueAdded !== undefined ? { valueAdded: list(f.valueAdded)! } : {}),
        ...(f.finalDemand !== undefined ? { finalDemand: list(f.finalDemand)! } : {}),
        ...(f.ignore !== undefined ? { ignore: list(f.ignore)! } : {}),
        ...(blanks ? { blanks } : {}),
        ...(f.zeroText?.length ? { zeroTexts: f.zeroText.map((t) => t.trim()).filter(Boolean) } : {}),
        ...numberOptions(f),
        ...(selectOption(f.select) ? { select: selectOption(f.select)! } : {}),
      },
    );
    bar.step('deriving the requirements');
  } finally {
    bar.stop();
  }
  const { read } = loaded;
  const model = supplyUse(read.input);
  // The scrap commodity used: given, or proposed by the reader (a 'scrap-commodity' note names it).
  const scrap = read.input.scrap;
  const scrapFrom = f.scrap !== undefined ? 'given' : scrap ? 'guessed' : 'default';
  let R = model.requirements(kind);
  let ax = model.axes(kind);
  // Direct requirements as agencies publish them: the value-added rows per unit of industry output
  // below the commodity rows (V ĝ⁻¹).
  const va = read.valueAdded;
  if (kind === 'direct' && va.V.rows > 0) {
    const ni = R.cols;
    const data = new Float64Array((R.rows + va.V.rows) * ni);
    data.set(R.data);
    for (let a = 0; a < va.V.rows; a++) for (let j = 0; j < ni; j++) data[(R.rows + a) * ni + j] = model.g[j]! > 0 ? va.V.data[a * ni + j]! / model.g[j]! : 0;
    R = { rows: R.rows + va.V.rows, cols: ni, data };
    ax = { rows: { codes: [...ax.rows.codes, ...va.axis.codes], labels: [...ax.rows.labels, ...va.axis.labels] }, cols: ax.cols };
  }
  const findings = sortFindings([...read.findings, ...model.findings]);
  if (findings.some((x) => x.severity === 'error')) throw new InputError('supply-use-errors', `the make and use tables cannot be used: ${findings.filter((x) => x.severity === 'error').map((x) => x.message).join('; ')}`);
  const k = KIND_TEXT[kind];
  const unit = kind === 'direct' ? 'per unit of industry output' : 'per unit of final demand';
  const m: LabelledMatrix = { title: k.title, about: k.about, rows: ax.rows, cols: ax.cols, matrix: R, unit, corner: k.corner };
  const settings = [
    setting('kind', 'Requirements', kind, 'given'),
    setting('technology', 'Technology assumption', model.technology, f.technology ? 'given' : 'default'),
    setting('scrap', 'Scrap commodity', scrap ?? null, scrapFrom, scrap ? undefined : 'No scrap adjustment'),
    setting('makeValueColumn', 'Make: value field', (read.mappings.make.valueField as number | undefined) ?? null, makeValue !== undefined ? 'given' : 'guessed'),
    setting('useValueColumn', 'Use: value field', (read.mappings.use.valueField as number | undefined) ?? null, useValue !== undefined ? 'given' : 'guessed'),
  ];
  const summary: TableSummary = {
    title: 'Make and use tables',
    moneyUnit: 'the money unit of the make and use tables',
    sectors: model.industries.codes.length,
    finalDemand: read.finalDemand.axis.codes.map((code, i) => ({ code, label: read.finalDemand.axis.labels[i]! })),
    valueAdded: read.valueAdded.axis.codes.map((code, i) => ({ code, label: read.valueAdded.axis.labels[i]! })),
    satellites: [],
    hasImports: false,
    invented: false,
    notes: [`${model.industries.codes.length} industries and ${model.commodities.codes.length} commodities.`],
  };
  const inputs = [reportInput(loaded.make.file, 'make', f.makeSheet), reportInput(loaded.use.file, 'use', f.useSheet)];
  const report = () =>
    buildReport({
      ...reportBase(ctx, f),
      title: k.title,
      tableSummary: summary,
      inputs,
      settings,
      assumptions: [
        model.technology === 'industry'
          ? 'Industry technology: each industry has one input structure whatever it makes, and commodities are supplied in fixed market shares (D = V̄ q̂⁻¹)' + (scrap ? `, with the output of scrap ('${scrap}') taken out of the market shares (W = (I − p̂)⁻¹ D).` : '.')
          : 'Commodity technology: each commodity has one input structure whichever industry makes it.',
        'Coefficients are fixed: no substitution, no economies of scale, no capacity limits.',
      ],
      findings,
      sections: [matrixSection({ id: `requirements-${kind}`, title: k.title, about: k.about, rows: ax.rows, cols: ax.cols, matrix: R, unit, corner: k.corner, sheet: 'Requirements' }), checksSection(findings)],
    });
  const about = { 'Make file': loaded.make.file.name, 'Make SHA-256': loaded.make.file.sha256, 'Use file': loaded.use.file.name, 'Use SHA-256': loaded.use.file.sha256, Technology: model.technology, Scrap: scrap ?? 'none', Cautions: CAUTION_LINE };
  return deliver(
    ctx,
    {
      json: () => ({
        kind,
        technology: model.technology,
        scrap: scrap ?? null,
        make: { file: loaded.make.file.name, sha256: loaded.make.file.sha256, shape: loaded.make.shape, valueField: read.mappings.make.valueField ?? null },
        use: { file: loaded.use.file.name, sha256: loaded.use.file.sha256, shape: loaded.use.shape, valueField: read.mappings.use.valueField ?? null },
        ...matrixJson(m),
        findings,
      }),
      text: (colour) => {
        const s = styles(colour);
        return `${k.title}: ${R.rows} × ${R.cols} (${model.industries.codes.length} industries, ${model.commodities.codes.length} commodities, ${model.technology} technology${scrap ? `, scrap ${scrap}` : ''})\n${findings.length ? `${findingsText(findings, colour)}\n` : ''}${s.dim('Write the matrix with --out FILE.csv (or .tsv, .xlsx, .json, .html).')}\n`;
      },
      writers: matrixWriters(m, report, about),
    },
    plan,
    f,
  );
}
