/** `ripplewise linkages TABLE`: backward and forward linkages, dispersion indices and key sectors. */
import { conventionLines, tableConventions } from '../../../engine/conventions';
import { KEY_SECTOR_GROUPS, LINKAGES_ABOUT, linkages } from '../../../engine/linkages';
import { LeontiefModel } from '../../../engine/leontief';
import { buildReport, checksSection, describeTable, linkagesSection, modelAssumptions } from '../../report/model';
import type { CommonFlags } from '../common';
import { checkedTable, reportBase, reportInputs, reportWriters, tableLine } from '../common';
import type { CliContext } from '../context';
import { styles } from '../context';
import { deliver, planOutputs } from '../output';
import { CAUTION_LINE, fixed, textTable } from '../text';
import { FORMATS } from '../register/linkages';

export interface Flags extends CommonFlags {
  variation?: boolean;
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  const plan = planOutputs(f, FORMATS);
  const loaded = await checkedTable(ctx, name, f);
  const t = loaded.table;
  const l = linkages(t, LeontiefModel.fromTable(t), { variation: f.variation !== false });
  const report = () =>
    buildReport({
      ...reportBase(ctx, f),
      title: `Linkages: ${t.meta.title ?? loaded.file.name}`,
      table: t,
      inputs: reportInputs(loaded),
      settings: [{ key: 'variation', label: 'Coefficients of variation', value: f.variation !== false, source: f.variation === false ? 'given' : 'default' }],
      assumptions: modelAssumptions(t, undefined, { typeII: 'off' }).filter((a) => !a.startsWith('No household') && !a.startsWith('Demand changes')),
      findings: [...loaded.checks, ...l.findings],
      sections: [linkagesSection(l), checksSection(loaded.checks)],
    });
  const arr = (a: Float64Array | undefined) => (a ? Array.from(a) : null);
  return deliver(
    ctx,
    {
      json: () => ({
        about: LINKAGES_ABOUT,
        file: loaded.file.name,
        sha256: loaded.file.sha256,
        table: describeTable(t),
        groups: KEY_SECTOR_GROUPS,
        sectors: l.sectors.codes.map((code, j) => ({
          code,
          label: l.sectors.labels[j]!,
          directBackward: l.directBackward[j]!,
          directForward: l.directForward[j]!,
          totalBackward: l.totalBackward[j]!,
          totalForward: l.totalForward[j]!,
          power: l.power[j]!,
          sensitivity: l.sensitivity[j]!,
          variationBackward: arr(l.variationBackward)?.[j] ?? null,
          variationForward: arr(l.variationForward)?.[j] ?? null,
          group: l.group[j]!,
        })),
        keySectors: l.groups.key,
        conventions: { ...tableConventions(t), lines: conventionLines(tableConventions(t), { linkages: true, multipliers: false, closure: false }) },
        findings: l.findings,
        cautions: l.cautions,
      }),
      text: (colour) => {
        const s = styles(colour);
        const rows = l.sectors.codes.map((c, j) => [c, l.sectors.labels[j]!.slice(0, 40), fixed(l.power[j], 3), fixed(l.sensitivity[j], 3), l.group[j]!]);
        return [
          tableLine(loaded),
          '',
          textTable([{ label: 'code' }, { label: 'sector' }, { label: 'backward index', align: 'right' }, { label: 'forward index', align: 'right' }, { label: 'group' }], rows),
          `Key sectors: ${l.groups.key.length ? l.groups.key.join(', ') : 'none'}`,
          ...l.findings.map((x) => s.dim(`  note: ${x.message}`)),
          s.bold('Conventions'),
          ...conventionLines(tableConventions(t), { linkages: true, multipliers: false, closure: false }).map((x) => s.dim(`  ${x}`)),
          s.dim(CAUTION_LINE),
          '',
        ].join('\n');
      },
      writers: reportWriters(report),
    },
    plan,
    f,
  );
}
