/** `ripplewise regionalise NATIONAL --regional FILE --method slq|cilq|flq|aflq|sdp [--delta 0.3] --out FILE`: a region's table from the nation's. */
import { checks } from '../../../engine/checks';
import { LeontiefModel } from '../../../engine/leontief';
import type { BasisKind, RegionalMethod } from '../../../engine/regional/index';
import { BASIS_KINDS, METHOD_NAMES, REGIONAL_CAUTIONS, REGIONAL_METHODS, regionalise, TwoRegionModel } from '../../../engine/regional/index';
import { buildReport, checksSection, setting } from '../../report/model';
import { regionalSection, twoRegionSection } from '../../report/regional';
import type { CommonFlags } from '../common';
import { checkedTable, numberOption, reportBase, reportInputs, tableLine } from '../common';
import type { CliContext } from '../context';
import { styles } from '../context';
import { UsageError } from '../errors';
import { reportInput } from '../files';
import { deliver, planOutputs } from '../output';
import { progress } from '../progress';
import { chooseBasis, readValues } from '../regional-input';
import { tableJson, tableWriters } from '../table-out';
import { CAUTION_LINE, fixed, textTable } from '../text';
import { FORMATS } from '../register/regionalise';

export interface Flags extends CommonFlags {
  regional?: string;
  regionalSheet?: string;
  method?: string;
  delta?: string;
  basis?: string;
  regionalColumn?: string;
  nationalColumn?: string;
  region?: string;
  concordance?: string;
  twoRegion?: boolean;
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  const method = (f.method ?? 'flq').toLowerCase() as RegionalMethod;
  if (!REGIONAL_METHODS.includes(method)) throw new UsageError(`--method must be one of ${REGIONAL_METHODS.join(', ')}; got '${f.method}'`, 'bad-method');
  const kind = (f.basis ?? 'employment').toLowerCase() as BasisKind;
  if (!BASIS_KINDS.includes(kind)) throw new UsageError(`--basis must be one of ${BASIS_KINDS.join(', ')}; got '${f.basis}'`, 'bad-basis');
  const delta = numberOption(f.delta, '--delta', { min: 0, max: 1 });
  if (delta !== undefined && method !== 'flq' && method !== 'aflq') throw new UsageError(`--delta applies to FLQ and AFLQ, not ${method.toUpperCase()}`, 'delta-not-used');
  if (!f.regional) throw new UsageError('regionalise needs --regional FILE', 'missing-option');
  const plan = planOutputs(f, FORMATS);
  const bar = await progress(ctx, 'regionalise', f.twoRegion ? 5 : 4, { json: !!f.json });
  try {
    bar.step('national table');
    const loaded = await checkedTable(ctx, name, f);
    const nat = loaded.table;
    bar.step('regional file');
    const read = await readValues(ctx, f.regional, 'regional file', nat.sectors, { ...(f.regionalSheet ? { sheet: f.regionalSheet } : {}), ...(f.concordance ? { concordance: f.concordance } : {}) });
    const choice = chooseBasis(nat, read, kind, { ...(f.regionalColumn ? { regionalColumn: f.regionalColumn } : {}), ...(f.nationalColumn ? { nationalColumn: f.nationalColumn } : {}), ...(f.region ? { name: f.region } : {}) });
    bar.step('quotients');
    const r = regionalise(nat, choice.basis, { method, ...(delta !== undefined ? { delta } : {}), source: { file: reportInput(read.file, 'regional').name, sha256: read.file.sha256 } });
    const found = [...read.findings, ...choice.findings, ...r.findings, ...checks(r.table)];
    bar.step('multipliers');
    const multN = new LeontiefModel(r.national).outputMultipliers();
    const multR = new LeontiefModel(r.A).outputMultipliers();
    let splits: ReturnType<TwoRegionModel['split']>['totals'][] | undefined;
    if (f.twoRegion) {
      bar.step('two regions');
      const two = new TwoRegionModel(nat, choice.basis, { method, ...(delta !== undefined ? { delta } : {}) });
      const n = nat.sectors.codes.length;
      splits = nat.sectors.codes.map((_, j) => {
        const d = new Float64Array(n);
        d[j] = 1;
        return two.split(d).totals;
      });
    }
    const settings = [
      setting('method', 'Regionalisation method', METHOD_NAMES[method], f.method ? 'given' : 'default'),
      ...(r.delta !== undefined ? [setting('delta', 'δ (FLQ, AFLQ)', r.delta, delta !== undefined ? 'given' : 'default', 'a common default, not measured for this region')] : []),
      ...(r.lambda !== undefined ? [setting('lambda', 'λ = [log2(1 + regional/national)]^δ', r.lambda, 'default', 'computed')] : []),
      setting('basis', 'Basis', `${kind} (${choice.basis.unit})`, f.basis ? 'given' : 'default'),
      setting('regionValues', "The region's values", choice.regionFrom, f.regionalColumn ? 'given' : 'guessed'),
      setting('nationValues', "The nation's values", choice.nationFrom, f.nationalColumn ? 'given' : 'guessed'),
      setting('share', "The region's share of the nation", r.share, 'default', 'computed'),
    ];
    const report = () =>
      buildReport({
        ...reportBase(ctx, f),
        title: r.table.meta.title ?? 'Regional table',
        table: r.table,
        inputs: reportInputs(loaded, [reportInput(read.file, 'regional', read.sheet), ...(read.concordance ? [reportInput(read.concordance, 'concordance')] : [])]),
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
