/** `ripplewise regionalise NATIONAL --regional FILE --method slq|cilq|flq|aflq|sdp [--delta 0.3] --out FILE`: a region's table from the nation's. */
import { METHOD_NAMES, REGIONAL_CAUTIONS } from '../../../engine/regional/index';
import type { TwoRegionSplit } from '../../../engine/regional/index';
import { buildReport, checksSection } from '../../report/model';
import { regionalSection, twoRegionSection } from '../../report/regional';
import type { CommonFlags } from '../common';
import { checkedTable, reportBase, reportInputs, tableLine } from '../common';
import type { CliContext } from '../context';
import { styles } from '../context';
import { deliver, planOutputs } from '../output';
import { progress } from '../progress';
import { regionalChoices, regionalRun } from '../regional-input';
import { twoRegionSplits } from '../regional-values';
import type { RegionalFlags } from '../regional-input';
import { tableJson, tableWriters } from '../table-out';
import { CAUTION_LINE, fixed, textTable } from '../text';
import { FORMATS } from '../register/regionalise';

export interface Flags extends CommonFlags, RegionalFlags {
  twoRegion?: boolean;
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  const { method } = regionalChoices(f);
  const plan = planOutputs(f, FORMATS);
  const bar = await progress(ctx, 'regionalise', f.twoRegion ? 5 : 4, { json: !!f.json });
  try {
    bar.step('national table');
    const loaded = await checkedTable(ctx, name, f);
    const nat = loaded.table;
    bar.step('regional file and quotients');
    const reg = await regionalRun(ctx, nat, f);
    const { choice, result: r, findings: found, national: multN, regional: multR, settings, delta, kind } = reg;
    bar.step('multipliers');
    let splits: TwoRegionSplit['totals'][] | undefined;
    if (f.twoRegion) {
      bar.step('two regions');
      splits = twoRegionSplits(nat, choice.basis, method, delta);
    }
    const report = () =>
      buildReport({
        ...reportBase(ctx, f),
        title: r.table.meta.title ?? 'Regional table',
        table: r.table,
        inputs: reportInputs(loaded, reg.inputs),
        settings,
        assumptions: [...(r.table.meta.notes ?? []).slice(-3)],
        findings: found,
        sections: [regionalSection({ result: r, national: multN, regional: multR }), ...(splits ? [twoRegionSection(r.sectors, splits)] : []), checksSection(found)],
      });
    const sectorsJson = () =>
      r.sectors.codes.map((code, i) => ({
        code,
        label: r.sectors.labels[i]!,
        region: r.basis.region[i]!,
        nation: r.basis.nation[i]!,
        slq: r.slq[i]!,
        quotient: r.sectorQuotient[i]!,
        localShare: r.localShare[i]!,
        cappedCells: r.capped.find((c) => c.code === code)?.cells ?? 0,
        outputMultiplier: { national: multN[i]!, regional: multR[i]! },
        ...(splits ? { twoRegion: splits[i] } : {}),
      }));
    return await deliver(
      ctx,
      {
        json: () => ({ about: r.about, file: loaded.file.name, sha256: loaded.file.sha256, provenance: r.provenance, settings: settings.map((s) => ({ key: s.key, value: s.value, source: s.source })), sectors: sectorsJson(), table: tableJson(r.table), findings: found, cautions: r.cautions }),
        text: (colour) => {
          const s = styles(colour);
          const head = `${tableLine(loaded)}\n${METHOD_NAMES[method]}${r.delta !== undefined ? `, δ = ${r.delta}, λ = ${r.lambda!.toFixed(4)}` : ''}; ${kind}: region ${(r.share * 100).toFixed(2)} % of the nation`;
          const cols = [{ label: 'code' }, { label: 'sector' }, { label: 'SLQ', align: 'right' as const }, ...(method === 'sdp' ? [{ label: 'supply/demand', align: 'right' as const }] : []), { label: 'local share', align: 'right' as const }, { label: 'capped', align: 'right' as const }, { label: 'mult. national', align: 'right' as const }, { label: 'mult. regional', align: 'right' as const }, ...(splits ? [{ label: 'intra', align: 'right' as const }, { label: 'feedback', align: 'right' as const }, { label: 'spillover', align: 'right' as const }] : [])];
          const rows = r.sectors.codes.map((c, i) => [c, r.sectors.labels[i]!.slice(0, 32), fixed(r.slq[i], 3), ...(method === 'sdp' ? [fixed(r.sectorQuotient[i], 3)] : []), fixed(r.localShare[i], 3), String(r.capped.find((x) => x.code === c)?.cells ?? 0), fixed(multN[i], 4), fixed(multR[i], 4), ...(splits ? [fixed(splits[i]!.intraregional, 4), fixed(splits[i]!.feedback, 4), fixed(splits[i]!.spillover, 4)] : [])]);
          const notes = found.filter((x) => x.severity !== 'note' || x.code === 'quotient-capped').map((x) => s.dim(`  ${x.severity}: ${x.message}`));
          return [head, '', textTable(cols, rows), ...notes, '', ...REGIONAL_CAUTIONS.map((c) => s.dim(c)), s.dim(CAUTION_LINE), ''].join('\n');
        },
        writers: tableWriters(r.table, report),
      },
      plan,
      f,
    );
  } finally {
    bar.stop();
  }
}
