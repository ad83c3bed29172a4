/** `ripplewise aggregate TABLE --concordance FILE --out FILE`: the same economy with fewer sectors. */
import { AGGREGATE_ABOUT, aggregate } from '../../../engine/aggregate';
import { checks } from '../../../engine/checks';
import { moneyUnit } from '../../../engine/table';
import { readConcordanceGrid, readConcordanceJson, readGrid } from '../../io/index';
import { buildReport, checksSection, matrixSection, setting } from '../../report/model';
import type { CommonFlags } from '../common';
import { reportBase, reportInputs } from '../common';
import type { CliContext } from '../context';
import { UsageError } from '../errors';
import { readInput, reportInput } from '../files';
import { deliver, planOutputs } from '../output';
import { loadTable } from '../table-input';
import { tableJson, tableWriters } from '../table-out';
import { textTable } from '../text';
import { FORMATS } from '../register/aggregate';

export interface Flags extends CommonFlags {
  concordance?: string;
  concordanceSheet?: string;
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  if (!f.concordance) throw new UsageError('aggregate needs --concordance FILE', 'missing-option');
  const plan = planOutputs(f, FORMATS);
  const loaded = await loadTable(ctx, name, f);
  const cf = await readInput(ctx, f.concordance, 'concordance');
  const text = new TextDecoder('utf-8').decode(cf.bytes);
  const con = /^\s*[{[]/.test(text.slice(0, 64)) ? readConcordanceJson(text, cf.name) : readConcordanceGrid((await readGrid(cf.bytes, { file: cf.name, ...(f.concordanceSheet ? { sheet: f.concordanceSheet } : {}) })).grid);
  const t = aggregate(loaded.table, con.concordance);
  const found = [...con.findings, ...checks(t)];
  const report = () =>
    buildReport({
      ...reportBase(ctx, f),
      title: `Aggregated: ${t.meta.title ?? loaded.file.name}`,
      table: t,
      inputs: reportInputs(loaded, [reportInput(cf, 'concordance', f.concordanceSheet)]),
      settings: [setting('groups', 'Groups', t.sectors.codes.join(', '), 'given')],
      assumptions: ['Flows, final demand, value added, output and satellites are summed over the sectors of each group; multipliers of the aggregated table differ from those of the detailed one.'],
      findings: found,
      sections: [matrixSection({ id: 'flows', title: 'Intermediate flows Z, aggregated', about: 'What each group (column) buys from each group (row).', rows: t.sectors, cols: t.sectors, matrix: t.Z, unit: moneyUnit(t.meta), style: 'amount', sheet: 'Flows' }), checksSection(found)],
    });
  return deliver(
    ctx,
    {
      json: () => ({ about: AGGREGATE_ABOUT, file: loaded.file.name, sha256: loaded.file.sha256, concordance: { file: cf.name, sha256: cf.sha256, from: con.concordance.from, to: con.concordance.to }, table: tableJson(t), findings: found }),
      text: () => `${loaded.table.sectors.codes.length} sectors into ${t.sectors.codes.length} groups\n${textTable([{ label: 'group' }, { label: 'label' }, { label: 'members', align: 'right' }, { label: `output (${moneyUnit(t.meta)})`, align: 'right' }], t.sectors.codes.map((g, i) => [g, t.sectors.labels[i]!.slice(0, 40), String(con.concordance.to.filter((x) => x === g).length), t.x[i]!.toFixed(2)]))}`,
      writers: tableWriters(t, report),
    },
    plan,
    f,
  );
}
