/** `ripplewise multipliers TABLE`: per-sector multipliers of every measure, simple and total, Type I and Type II. */
import { closureLine, conventionLines } from '../../../engine/conventions';
import { multipliers, MULTIPLIERS_ABOUT } from '../../../engine/multipliers';
import type { Multipliers } from '../../../engine/multipliers';
import { buildReport, describeTable, multipliersSection, checksSection } from '../../report/model';
import type { CommonFlags } from '../common';
import { checkedTable, reportBase, reportInputs, reportWriters, settingsJson, tableLine } from '../common';
import type { CliContext } from '../context';
import { styles } from '../context';
import type { ModelFlags } from '../model-options';
import { prepareModels } from '../model-options';
import { deliver, planOutputs } from '../output';
import { CAUTION_LINE, fixed, textTable } from '../text';
import { FORMATS } from '../register/multipliers';

export type Flags = CommonFlags & ModelFlags;

/** The JSON of one measure's multipliers: blanks (Type I and II where the direct effect is 0) are null. */
export function multipliersJson(m: Multipliers) {
  const v = (a: Float64Array | undefined, j: number) => (a && Number.isFinite(a[j]!) ? a[j]! : null);
  return {
    code: m.measure.code,
    label: m.measure.label,
    kind: m.measure.kind,
    unit: m.unit,
    ratioUnit: 'ratio',
    sectors: m.sectors.codes.map((code, j) => ({
      code,
      label: m.sectors.labels[j]!,
      direct: v(m.direct, j),
      indirect: v(m.indirect, j),
      simple: v(m.simple, j),
      induced: v(m.induced, j),
      total: v(m.total, j),
      typeI: v(m.typeI, j),
      typeII: v(m.typeII, j),
      ...(m.firstRound ? { firstRound: v(m.firstRound, j), laterRounds: v(m.laterRounds, j) } : {}),
    })),
    notes: m.findings.map((f) => f.message.replace(/ \(NaN\)$/, '')),
  };
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  const plan = planOutputs(f, FORMATS);
  const loaded = await checkedTable(ctx, name, f);
  const t = loaded.table;
  const prep = prepareModels(t, f, loaded.file.name);
  const list = multipliers(prep.models, prep.measures, { rounds: prep.rounds });
  const report = () =>
    buildReport({
      ...reportBase(ctx, f),
      title: `Multipliers: ${t.meta.title ?? loaded.file.name}`,
      table: t,
      inputs: reportInputs(loaded),
      settings: prep.settings,
      assumptions: prep.assumptions,
      findings: [...loaded.checks, ...(prep.models.closure?.findings ?? [])],
      sections: [multipliersSection(list), checksSection(loaded.checks)],
    });
  return deliver(
    ctx,
    {
      json: () => ({
        about: MULTIPLIERS_ABOUT,
        file: loaded.file.name,
        sha256: loaded.file.sha256,
        table: describeTable(t),
        typeII: prep.closure === 'closed',
        settings: settingsJson(prep.settings),
        conventions: prep.conventions,
        measures: list.map(multipliersJson),
        findings: [...loaded.checks, ...(prep.models.closure?.findings ?? [])],
        cautions: list[0]?.cautions ?? [],
      }),
      text: (colour) => {
        const s = styles(colour);
        const out = [`${tableLine(loaded)}`, prep.closure === 'closed' ? `Type II closed with ${prep.settings.filter((x) => x.key === 'householdColumn' || x.key === 'labourIncomeRow').map((x) => `${x.value} (${x.source})`).join(' and ')}` : 'Type II: not available (no household closure)', closureLine(prep.conventions.closure), ''];
        for (const m of list) {
          const closed = m.total !== undefined;
          out.push(s.bold(`${m.measure.label} multipliers (${m.unit})`));
          const rounds = m.firstRound !== undefined;
          const cols = [{ label: 'code' }, { label: 'sector' }, ...(rounds ? [{ label: 'first round', align: 'right' as const }, { label: 'later rounds', align: 'right' as const }] : []), { label: 'simple', align: 'right' as const }, ...(closed ? [{ label: 'total', align: 'right' as const }] : []), { label: 'Type I', align: 'right' as const }, ...(closed ? [{ label: 'Type II', align: 'right' as const }] : [])];
          const rows = m.sectors.codes.map((c, j) => [c, m.sectors.labels[j]!.slice(0, 40), ...(rounds ? [fixed(m.firstRound![j], 4), fixed(m.laterRounds![j], 4)] : []), fixed(m.simple[j], 4), ...(closed ? [fixed(m.total![j], 4)] : []), fixed(m.typeI[j], 3), ...(closed ? [fixed(m.typeII![j], 3)] : [])]);
          out.push(textTable(cols, rows));
          for (const n of m.findings) out.push(s.dim(`  note: ${n.message.replace(/ \(NaN\)$/, '')}`));
        }
        for (const w of prep.models.closure?.findings ?? []) if (w.severity !== 'note') out.push(s.yellow(`${w.severity}: ${w.message}`));
        out.push(s.bold('Conventions'), ...conventionLines(prep.conventions, { closure: false, rounds: prep.rounds }).map((l) => s.dim(`  ${l}`)));
        out.push(s.dim(CAUTION_LINE), '');
        return out.join('\n');
      },
      writers: reportWriters(report),
    },
    plan,
    f,
  );
}
