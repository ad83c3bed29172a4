/**
 * `ripplewise report TABLE [--scenario FILE]`: the whole report of a table: checks, multipliers,
 * linkages and key sectors, the sensitivity tornado and, with scenarios, their impacts.
 */
import { impacts } from '../../../engine/impact';
import { linkages } from '../../../engine/linkages';
import { multipliers } from '../../../engine/multipliers';
import type { ResultTarget } from '../../../engine/sensitivity';
import { sectorIndex } from '../../../engine/table';
import { tornado } from '../../../engine/tornado';
import type { Section } from '../../report/model';
import { buildReport, checksSection, comparisonSection, linkagesSection, multipliersSection, scenarioSection, setting, tornadoSection } from '../../report/model';
import type { CommonFlags } from '../common';
import { checkedTable, numberOption, reportBase, reportInputs, reportWriters } from '../common';
import type { CliContext } from '../context';
import { UsageError } from '../errors';
import { reportInput } from '../files';
import type { ModelFlags } from '../model-options';
import { prepareModels } from '../model-options';
import { deliver, planOutputs } from '../output';
import { progress } from '../progress';
import type { LoadedScenarios } from '../scenario-input';
import { loadScenarios } from '../scenario-input';
import { FORMATS } from '../register/report';
import { regionalChoices, regionalRun } from '../regional-input';
import type { RegionalFlags } from '../regional-input';
import { regionalSection } from '../../report/regional';

export interface Flags extends CommonFlags, ModelFlags, RegionalFlags {
  scenario?: string;
  name?: string[];
  title?: string;
  tornado?: boolean;
  tornadoSector?: string;
  tornadoTop?: string;
  tornadoPercent?: string;
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  const plan = planOutputs(f, FORMATS);
  if (!plan.length && !f.json) throw new UsageError('report writes files: give --out FILE.html (or .xlsx, .json, .csv), or --format', 'no-output', 'For a quick look in the terminal, use multipliers, impact or linkages');
  const top = numberOption(f.tornadoTop, '--tornado-top', { min: 1, max: 100, integer: true }) ?? 10;
  const percent = numberOption(f.tornadoPercent, '--tornado-percent', { min: 0.001, max: 100 }) ?? 10;
  const regionalGiven = f.method !== undefined || f.delta !== undefined || f.basis !== undefined || f.regionalColumn !== undefined || f.nationalColumn !== undefined || f.region !== undefined || f.concordance !== undefined || f.regionalSheet !== undefined;
  if (regionalGiven && !f.regional) throw new UsageError('the regional options (--method, --delta, --basis, ...) need --regional FILE', 'missing-option');
  if (f.regional) regionalChoices(f);
  const bar = await progress(ctx, 'report', 6, f);
  try {
    bar.step('reading the table');
    const loaded = await checkedTable(ctx, name, f);
    const t = loaded.table;
    let sc: LoadedScenarios | undefined;
    if (f.scenario) {
      bar.step('reading the scenarios');
      sc = await loadScenarios(ctx, f.scenario, t, f.name);
    } else if (f.name) throw new UsageError('--name picks scenarios: add --scenario FILE', 'missing-option');
    bar.step('factoring the model');
    const prep = prepareModels(t, f, loaded.file.name);
    bar.step('multipliers and linkages');
    const mult = multipliers(prep.models, prep.measures, { rounds: prep.rounds });
    const link = linkages(t, prep.models.open);
    bar.step('scenarios');
    const results = sc ? impacts(prep.models, sc.resolved, prep.measures, { rounds: prep.rounds }) : [];
    const settings = [...prep.settings];
    const sections: Section[] = [];
    if (sc) {
      settings.push(setting('scenarios', 'Scenarios', sc.resolved.map((r) => r.name).join('; '), f.name ? 'given' : 'default'));
      if (results.length > 1) sections.push(comparisonSection(results));
      sc.resolved.forEach((r, k) => sections.push(scenarioSection(r, results[k]!, { index: k + 1 })));
    }
    sections.push(multipliersSection(mult), linkagesSection(link));
    const reg = f.regional ? await regionalRun(ctx, t, f) : undefined;
    if (reg) {
      sections.push(regionalSection({ result: reg.result, national: reg.national, regional: reg.regional }));
      settings.push(...reg.settings.map((x) => ({ ...x, key: `regional.${x.key}`, label: `Regional table: ${x.label}` })));
    }
    if (f.tornado !== false) {
      bar.step('sensitivity');
      let target: ResultTarget;
      let what: string;
      let unit: string;
      const money = mult[0]!.measure.unit;
      if (f.tornadoSector !== undefined) {
        const j = sectorIndex(t, f.tornadoSector);
        target = { kind: 'multiplier', sector: j };
        what = `Output multiplier of ${t.sectors.codes[j]} (${t.sectors.labels[j]})`;
        unit = `${money} per ${money} of final demand`;
      } else if (sc && results.length) {
        target = { kind: 'impact', d: sc.resolved[0]!.demand };
        what = `Total output impact of '${sc.resolved[0]!.name}' (open model)`;
        unit = money;
      } else {
        const om = prep.models.open.outputMultipliers();
        let j = 0;
        for (let i = 1; i < om.length; i++) if (om[i]! > om[j]!) j = i;
        target = { kind: 'multiplier', sector: j };
        what = `Output multiplier of ${t.sectors.codes[j]} (${t.sectors.labels[j]}), the largest`;
        unit = `${money} per ${money} of final demand`;
      }
      const data = tornado(prep.models.open, target, { top, percent });
      sections.push(tornadoSection({ data, sectors: t.sectors, target: what, unit }));
      settings.push(setting('tornado', 'Sensitivity tornado', what, f.tornadoSector ? 'given' : 'default'), setting('tornadoPercent', 'Tornado swing (%)', percent, f.tornadoPercent ? 'given' : 'default'), setting('tornadoTop', 'Tornado coefficients', top, f.tornadoTop ? 'given' : 'default'));
    } else settings.push(setting('tornado', 'Sensitivity tornado', 'off', 'given'));
    sections.push(checksSection(loaded.checks, { condition: prep.models.open.condition() }));
    bar.stop();
    const title = f.title ?? (sc ? (sc.resolved.length === 1 ? `Impact of ${sc.resolved[0]!.name}` : `Impacts of ${sc.resolved.length} scenarios`) : `Input-output report: ${t.meta.title ?? loaded.file.name}`);
    let built: ReturnType<typeof buildReport> | undefined;
    const report = () =>
      (built ??= buildReport({
        ...reportBase(ctx, f),
        title,
        subtitle: t.meta.title ?? loaded.file.name,
        table: t,
        inputs: reportInputs(loaded, [...(sc ? [reportInput(sc.file, 'scenarios')] : []), ...(reg?.inputs ?? [])]),
        settings,
        assumptions: prep.assumptions,
        findings: [...loaded.checks, ...(prep.models.closure?.findings ?? []), ...link.findings, ...results.flatMap((r) => r.findings), ...(reg?.findings ?? [])],
        sections,
      }));
    return deliver(
      ctx,
      {
        json: () => report(),
        text: () => '',
        writers: reportWriters(report),
      },
      plan,
      f,
    );
  } finally {
    bar.stop();
  }
}
