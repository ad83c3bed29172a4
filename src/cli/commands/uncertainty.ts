/**
 * `ripplewise uncertainty TABLE`: Monte Carlo on the technical coefficients (multiplicative
 * log-normal noise with a stated coefficient of variation), run across worker threads: the
 * percentiles of every measure's multipliers by sector and, with --scenario, of each scenario's
 * totals. Every draw depends only on the seed and its index, so the result is the same whatever
 * the number of workers. Ctrl-C cancels the run (exit 2).
 */
import { availableParallelism } from 'node:os';
import { CancelledError } from '../../../engine/errors';
import type { Measure } from '../../../engine/measures';
import { multiplierUnit } from '../../../engine/measures';
import type { MonteCarloResult, MonteCarloSpec, ProductivityRule } from '../../../engine/uncertainty';
import { monteCarlo } from '../../../engine/uncertainty';
import { monteCarloInWorkers } from '../../parallel/montecarlo-node';
import { buildReport, checksSection, describeTable, setting, uncertaintySection } from '../../report/model';
import type { CommonFlags } from '../common';
import { checkedTable, numberOption, reportBase, reportInputs, reportWriters, settingsJson, tableLine } from '../common';
import type { CliContext } from '../context';
import { styles } from '../context';
import { UsageError } from '../errors';
import { reportInput } from '../files';
import type { ModelFlags } from '../model-options';
import { prepareModels } from '../model-options';
import { deliver, planOutputs } from '../output';
import { progress } from '../progress';
import { loadScenarios } from '../scenario-input';
import { CAUTION_LINE, fixed, textTable } from '../text';
import { FORMATS, MAX_WORKERS } from '../register/uncertainty';

export interface Flags extends CommonFlags, Omit<ModelFlags, 'household' | 'householdColumn' | 'labourIncomeRow' | 'propensity'> {
  cv?: string;
  draws?: string;
  seed?: string;
  workers?: string;
  productivity?: string;
  scenario?: string;
  name?: string[];
}

/** The unit of a measure's multipliers and of its impacts. */
function unitsOf(m: Measure): { multiplier: string; impact: string } {
  return { multiplier: multiplierUnit(m), impact: m.unit };
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  const plan = planOutputs(f, FORMATS);
  const cv = numberOption(f.cv ?? '0.1', '--cv', { min: 0 })!;
  if (!(cv > 0) || cv > 2) throw new UsageError(`--cv must be above 0 and at most 2 (0.1 is 10 %); got '${f.cv}'`, 'bad-cv');
  const draws = numberOption(f.draws ?? '1000', '--draws', { min: 1, max: 1_000_000, integer: true })!;
  const seed = numberOption(f.seed ?? '1', '--seed', { min: 0, max: Number.MAX_SAFE_INTEGER, integer: true })!;
  const workers = f.workers === undefined ? Math.max(1, Math.min(MAX_WORKERS, availableParallelism())) : numberOption(f.workers, '--workers', { min: 1, integer: true })!;
  if (workers > MAX_WORKERS) throw new UsageError(`--workers must be from 1 to ${MAX_WORKERS}; got ${workers}`, 'bad-workers');
  if (f.productivity !== undefined && f.productivity !== 'column-sums' && f.productivity !== 'perron') {
    throw new UsageError(`--productivity must be column-sums or perron; got '${f.productivity}'`, 'bad-productivity');
  }
  const loaded = await checkedTable(ctx, name, f);
  const t = loaded.table;
  const prep = prepareModels(t, { ...f, household: false });
  const sc = f.scenario ? await loadScenarios(ctx, f.scenario, t, f.name) : undefined;
  if (!f.scenario && f.name?.length) throw new UsageError('--name chooses scenarios of --scenario FILE; give the file', 'missing-option');
  const A = prep.models.open.A;
  const spec: MonteCarloSpec = {
    A: { rows: A.rows, cols: A.cols, data: A.data },
    cv,
    draws,
    seed,
    sectors: [...t.sectors.codes],
    measures: prep.measures.map((m) => ({ code: m.code, label: m.label, unit: unitsOf(m).multiplier, c: m.coefficients })),
    scenarios: (sc?.resolved ?? []).map((s, k) => ({ code: `s${k + 1}`, label: s.name, d: s.demand })),
    ...(f.productivity ? { productivity: f.productivity as ProductivityRule } : {}),
  };
  const bar = await progress(ctx, 'uncertainty', draws, f);
  const abort = new AbortController();
  const onSigint = () => abort.abort();
  process.once('SIGINT', onSigint);
  let r: MonteCarloResult;
  const started = Date.now();
  try {
    const onProgress = (done: number, total: number) => bar.update(done, total);
    r = workers === 1 ? monteCarlo(spec, { onProgress, signal: abort.signal }) : await monteCarloInWorkers(spec, { workers, onProgress, signal: abort.signal });
  } catch (e) {
    if (e instanceof CancelledError) throw new CancelledError(`${e.message} (Ctrl-C)`);
    throw e;
  } finally {
    process.removeListener('SIGINT', onSigint);
    bar.stop();
  }
  const seconds = (Date.now() - started) / 1000;
  const units = prep.measures.map(unitsOf);
  const settings = [
    ...prep.settings.filter((s) => s.key !== 'household'),
    setting('cv', 'Coefficient of variation of every coefficient', cv, f.cv === undefined ? 'default' : 'given'),
    setting('draws', 'Draws', draws, f.draws === undefined ? 'default' : 'given'),
    setting('seed', 'Seed', seed, f.seed === undefined ? 'default' : 'given'),
    setting('productivity', 'Draws rejected when', r.productivity === 'perron' ? 'the Perron root of A is 1 or more' : 'a column of A sums to 1 or more', f.productivity ? 'given' : 'default'),
    setting('workers', 'Worker threads', workers, f.workers === undefined ? 'default' : 'given', 'The result does not depend on it'),
  ];
  const report = () =>
    buildReport({
      ...reportBase(ctx, f),
      title: `Uncertainty: ${t.meta.title ?? loaded.file.name}`,
      table: t,
      inputs: reportInputs(loaded, sc ? [reportInput(sc.file, 'scenarios')] : []),
      settings,
      assumptions: [...prep.assumptions.filter((a) => !/household/i.test(a)), 'Open model: direct and indirect effects only; no induced household spending.'],
      findings: [...loaded.checks, ...r.findings],
      sections: [uncertaintySection({ result: r, sectors: t.sectors, units, cv }), checksSection(loaded.checks)],
    });
  const summary = (x: MonteCarloResult['multipliers'][number]['bySector'][number]) => ({ point: x.point, mean: x.mean, sd: x.sd, p5: x.p5, p50: x.p50, p95: x.p95, min: x.min, max: x.max });
  return deliver(
    ctx,
    {
      json: () => ({
        about: r.about,
        file: loaded.file.name,
        sha256: loaded.file.sha256,
        table: describeTable(t),
        errorModel: r.errorModel,
        cv,
        seed: r.seed,
        productivity: r.productivity,
        draws: r.draws,
        accepted: r.accepted,
        rejected: { total: r.rejected.total, byReason: r.rejected.byReason, bySector: r.rejected.bySector },
        workers,
        settings: settingsJson(settings),
        measures: r.multipliers.map((m, k) => ({
          code: m.measure,
          label: r.measures[k]!.label ?? m.measure,
          unit: units[k]!.multiplier,
          sectors: r.sectors.map((code, j) => ({ code, label: t.sectors.labels[j]!, ...summary(m.bySector[j]!) })),
        })),
        scenarios: r.scenarios.map((s) => ({
          name: s.label,
          measures: s.measures.map((m, k) => ({ code: m.measure, unit: units[k]!.impact, total: summary(m.total) })),
        })),
        findings: r.findings,
        cautions: r.cautions,
      }),
      text: (colour) => {
        const s = styles(colour);
        const m = r.multipliers[0]!;
        const rows = r.sectors.map((c, j) => [c, t.sectors.labels[j]!.slice(0, 36), fixed(m.bySector[j]!.point, 3), fixed(m.bySector[j]!.p5, 3), fixed(m.bySector[j]!.p50, 3), fixed(m.bySector[j]!.p95, 3)]);
        const out = [
          tableLine(loaded),
          `${r.errorModel} ${r.accepted} of ${r.draws} draws accepted (seed ${r.seed}; ${workers} worker${workers > 1 ? 's' : ''}, ${seconds.toFixed(1)} s)`,
          '',
          s.bold(`${r.measures[0]!.label ?? m.measure} multipliers (${units[0]!.multiplier})`),
          textTable([{ label: 'code' }, { label: 'sector' }, { label: 'table', align: 'right' }, { label: 'p5', align: 'right' }, { label: 'median', align: 'right' }, { label: 'p95', align: 'right' }], rows),
        ];
        for (const sc2 of r.scenarios) {
          out.push('', s.bold(sc2.label));
          out.push(
            textTable(
              [{ label: 'measure' }, { label: 'table', align: 'right' }, { label: 'p5', align: 'right' }, { label: 'median', align: 'right' }, { label: 'p95', align: 'right' }, { label: 'unit' }],
              sc2.measures.map((x, k) => [r.measures[k]!.label ?? x.measure, fixed(x.total.point, 2), fixed(x.total.p5, 2), fixed(x.total.p50, 2), fixed(x.total.p95, 2), units[k]!.impact]),
            ),
          );
        }
        for (const fd of r.findings) out.push(s.dim(`  ${fd.message}`));
        out.push(s.dim(CAUTION_LINE), '');
        return out.join('\n');
      },
      writers: reportWriters(report),
    },
    plan,
    f,
  );
}
