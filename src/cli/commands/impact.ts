/** `ripplewise impact TABLE --scenario FILE`: each scenario's direct, indirect and induced effects on every sector and measure. */
import { closureLine, conventionLines } from '../../../engine/conventions';
import type { Impact } from '../../../engine/impact';
import { IMPACT_ABOUT, impacts } from '../../../engine/impact';
import { multipliers } from '../../../engine/multipliers';
import type { ResolvedScenario } from '../../../engine/scenario';
import type { Section } from '../../report/model';
import { buildReport, checksSection, comparisonSection, describeTable, multipliersSection, scenarioSection } from '../../report/model';
import type { CommonFlags } from '../common';
import { checkedTable, reportBase, reportInputs, reportWriters, settingsJson, tableLine } from '../common';
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
import { FORMATS } from '../register/impact';

export interface Flags extends CommonFlags, ModelFlags {
  scenario?: string;
  name?: string[];
}

export function impactJson(r: ResolvedScenario, im: Impact) {
  return {
    name: r.name,
    description: r.description ?? null,
    moneyUnit: r.unit,
    totalGross: r.totalGross,
    totalLocal: r.totalLocal,
    changes: r.changes.map((c) => ({ position: c.position, sector: c.sector, category: c.category ?? null, amount: c.amount, localShare: c.localShare, local: c.local })),
    closed: im.closed,
    householdIncome: im.householdIncome,
    residual: im.residual,
    measures: im.measures.map((m) => ({
      code: m.measure.code,
      label: m.measure.label,
      kind: m.measure.kind,
      unit: m.unit,
      totals: m.totals,
      sectors: im.sectors.codes.map((code, i) => ({
        code,
        label: im.sectors.labels[i]!,
        direct: m.direct[i]!,
        indirect: m.indirect[i]!,
        ...(m.firstRound ? { firstRound: m.firstRound[i]!, laterRounds: m.laterRounds![i]! } : {}),
        induced: m.induced[i]!,
        total: m.total[i]!,
      })),
    })),
    findings: im.findings,
  };
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  if (!f.scenario) throw new UsageError('impact needs --scenario FILE', 'missing-option');
  const plan = planOutputs(f, FORMATS);
  const bar = await progress(ctx, 'impact', 5, f);
  try {
    bar.step('reading the table');
    const loaded = await checkedTable(ctx, name, f);
    const t = loaded.table;
    bar.step('reading the scenarios');
    const sc = await loadScenarios(ctx, f.scenario, t, f.name);
    bar.step('factoring the model');
    const prep = prepareModels(t, f, loaded.file.name);
    bar.step('solving the scenarios');
    const results = impacts(prep.models, sc.resolved, prep.measures, { rounds: prep.rounds });
    const mult = multipliers(prep.models, prep.measures, { rounds: prep.rounds });
    bar.stop();
    const report = () => {
      const sections: Section[] = sc.resolved.map((r, k) => scenarioSection(r, results[k]!, { index: k + 1 }));
      if (results.length > 1) sections.unshift(comparisonSection(results));
      sections.push(multipliersSection(mult), checksSection(loaded.checks));
      return buildReport({
        ...reportBase(ctx, f),
        title: sc.resolved.length === 1 ? `Impact of ${sc.resolved[0]!.name}` : `Impacts of ${sc.resolved.length} scenarios`,
        subtitle: t.meta.title ?? loaded.file.name,
        table: t,
        inputs: reportInputs(loaded, [reportInput(sc.file, 'scenarios')]),
        settings: [...prep.settings, { key: 'scenarios', label: 'Scenarios', value: sc.resolved.map((r) => r.name).join('; '), source: f.name ? 'given' : 'default' }],
        assumptions: prep.assumptions,
        findings: [...loaded.checks, ...(prep.models.closure?.findings ?? []), ...results.flatMap((r) => r.findings)],
        sections,
      });
    };
    const code = await deliver(
      ctx,
      {
        json: () => ({
          about: IMPACT_ABOUT,
          file: loaded.file.name,
          sha256: loaded.file.sha256,
          scenarioFile: sc.file.name,
          scenarioSha256: sc.file.sha256,
          table: describeTable(t),
          typeII: prep.closure === 'closed',
          settings: settingsJson(prep.settings),
          conventions: prep.conventions,
          scenarios: sc.resolved.map((r, k) => impactJson(r, results[k]!)),
          cautions: results[0]?.cautions ?? [],
        }),
        text: (colour) => {
          const s = styles(colour);
          const out = [tableLine(loaded), ''];
          sc.resolved.forEach((r, k) => {
            const im = results[k]!;
            out.push(s.bold(`${r.name}`), `  demand change ${fixed(r.totalGross, 2)} ${r.unit}, of which local ${fixed(r.totalLocal, 2)} ${r.unit}`);
            out.push(
              textTable(
                [
                  { label: 'measure' },
                  { label: 'direct', align: 'right' },
                  { label: 'indirect', align: 'right' },
                  ...(prep.rounds ? [{ label: 'first round', align: 'right' as const }, { label: 'later rounds', align: 'right' as const }] : []),
                  { label: 'induced', align: 'right' },
                  { label: 'total', align: 'right' },
                  { label: 'unit' },
                ],
                im.measures.map((m) => [m.measure.label, fixed(m.totals.direct, 2), fixed(m.totals.indirect, 2), ...(prep.rounds ? [fixed(m.totals.firstRound ?? NaN, 2), fixed(m.totals.laterRounds ?? NaN, 2)] : []), fixed(m.totals.induced, 2), fixed(m.totals.total, 2), m.unit]),
              ),
            );
            if (!im.closed) out.push(s.dim('  no household closure: induced effects are zero'));
          });
          out.push(s.dim(`  ${closureLine(prep.conventions.closure)}`));
          for (const w of prep.models.closure?.findings ?? []) if (w.severity !== 'note') out.push(s.yellow(`  ${w.severity}: ${w.message}`));
          out.push(s.bold('Conventions'), ...conventionLines(prep.conventions, { closure: false, rounds: prep.rounds }).map((l) => s.dim(`  ${l}`)));
          out.push(s.dim(CAUTION_LINE), '');
          return out.join('\n');
        },
        writers: reportWriters(report),
      },
      plan,
      f,
    );
    return code;
  } finally {
    bar.stop();
  }
}
