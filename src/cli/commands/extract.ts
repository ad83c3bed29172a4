/** `ripplewise extract TABLE [--sector CODES]`: hypothetical extraction of a sector or group, or of each sector in turn. */
import { EXTRACTION_ABOUT, EXTRACTION_RANKING_ABOUT, extractEach, extraction } from '../../../engine/extraction';
import { LeontiefModel } from '../../../engine/leontief';
import { buildReport, checksSection, describeTable, extractionRankingSection, extractionSection, modelAssumptions, setting } from '../../report/model';
import type { CommonFlags } from '../common';
import { checkedTable, reportBase, reportInputs, reportWriters, tableLine } from '../common';
import type { CliContext } from '../context';
import { list } from '../model-options';
import { deliver, planOutputs } from '../output';
import { CAUTION_LINE, fixed, textTable } from '../text';
import { FORMATS } from '../register/extract';

export interface Flags extends CommonFlags {
  sector?: string;
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  const plan = planOutputs(f, FORMATS);
  const loaded = await checkedTable(ctx, name, f);
  const t = loaded.table;
  const model = LeontiefModel.fromTable(t);
  const group = list(f.sector);
  const base = {
    ...reportBase(ctx, f),
    table: t,
    inputs: reportInputs(loaded),
    assumptions: [
      ...modelAssumptions(t).filter((a) => !a.startsWith('No household') && !a.startsWith('Demand changes')),
      'The baseline is the table itself: final demand f = x − Z i and primary inputs v′ = x′ − i′Z; the forward extraction uses the Ghosh supply-driven model.',
    ],
    findings: loaded.checks,
  };
  if (group && group.length) {
    const e = extraction(t, model, group);
    const report = () => buildReport({ ...base, title: `Extraction of ${e.extracted.join(', ')}`, settings: [setting('sector', 'Extracted sectors', e.extracted.join(', '))], sections: [extractionSection(e), checksSection(loaded.checks)] });
    const part = (p: typeof e.total) => ({ loss: p.loss, lossPercent: p.lossPercent, lossBySector: Array.from(p.lossBySector), output: Array.from(p.output) });
    return deliver(
      ctx,
      {
        json: () => ({ about: EXTRACTION_ABOUT, file: loaded.file.name, sha256: loaded.file.sha256, table: describeTable(t), unit: e.unit, extracted: e.extracted, sectors: e.sectors, baseline: Array.from(e.baseline), baselineTotal: e.baselineTotal, total: part(e.total), backward: part(e.backward), forward: part(e.forward), cautions: e.cautions }),
        text: () =>
          [
            tableLine(loaded),
            `Extracted: ${e.extracted.join(', ')}`,
            textTable(
              [{ label: 'extraction' }, { label: `output lost (${e.unit})`, align: 'right' }, { label: '% of total', align: 'right' }],
              [
                ['total', fixed(e.total.loss, 2), fixed(e.total.lossPercent, 3)],
                ['backward only', fixed(e.backward.loss, 2), fixed(e.backward.lossPercent, 3)],
                ['forward only', fixed(e.forward.loss, 2), fixed(e.forward.lossPercent, 3)],
              ],
            ),
            CAUTION_LINE,
            '',
          ].join('\n'),
        writers: reportWriters(report),
      },
      plan,
      f,
    );
  }
  const r = extractEach(t, model);
  const report = () => buildReport({ ...base, title: `Extraction of each sector: ${t.meta.title ?? loaded.file.name}`, settings: [setting('sector', 'Extracted sectors', 'each in turn', 'default')], sections: [extractionRankingSection(r), checksSection(loaded.checks)] });
  const order = r.sectors.codes.map((_, i) => i).sort((a, b) => r.total[b]! - r.total[a]!);
  return deliver(
    ctx,
    {
      json: () => ({
        about: EXTRACTION_RANKING_ABOUT,
        file: loaded.file.name,
        sha256: loaded.file.sha256,
        table: describeTable(t),
        unit: r.unit,
        baselineTotal: r.baselineTotal,
        sectors: r.sectors.codes.map((code, i) => ({ code, label: r.sectors.labels[i]!, total: r.total[i]!, totalPercent: r.totalPercent[i]!, backward: r.backward[i]!, backwardPercent: r.backwardPercent[i]!, forward: r.forward[i]!, forwardPercent: r.forwardPercent[i]! })),
        cautions: r.cautions,
      }),
      text: () =>
        [
          tableLine(loaded),
          textTable(
            [{ label: 'code' }, { label: 'sector' }, { label: `total (${r.unit})`, align: 'right' }, { label: '%', align: 'right' }, { label: 'backward', align: 'right' }, { label: 'forward', align: 'right' }],
            order.map((i) => [r.sectors.codes[i]!, r.sectors.labels[i]!.slice(0, 36), fixed(r.total[i], 2), fixed(r.totalPercent[i], 2), fixed(r.backward[i], 2), fixed(r.forward[i], 2)]),
          ),
          CAUTION_LINE,
          '',
        ].join('\n'),
      writers: reportWriters(report),
    },
    plan,
    f,
  );
}
