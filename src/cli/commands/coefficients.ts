/** `ripplewise coefficients TABLE`: technical coefficients A, the Leontief inverse L, allocation coefficients B or the Ghosh inverse G. */
import { allocationCoefficients, GhoshModel } from '../../../engine/ghosh';
import { LeontiefModel } from '../../../engine/leontief';
import type { Matrix } from '../../../engine/linalg/matrix';
import { moneyUnit } from '../../../engine/table';
import { buildReport, checksSection, describeTable, matrixSection, modelAssumptions, setting } from '../../report/model';
import type { CommonFlags } from '../common';
import { checkedTable, reportBase, reportInputs, tableLine } from '../common';
import type { CliContext } from '../context';
import { UsageError } from '../errors';
import type { LabelledMatrix } from '../matrix-out';
import { matrixJson, matrixWriters } from '../matrix-out';
import { deliver, planOutputs } from '../output';
import { CAUTION_LINE } from '../text';
import { COEFFICIENT_KINDS, FORMATS } from '../register/coefficients';

export interface Flags extends CommonFlags {
  kind?: string;
}

type Kind = keyof typeof COEFFICIENT_KINDS;

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  const kind = (f.kind ?? 'technical') as Kind;
  if (!(kind in COEFFICIENT_KINDS)) throw new UsageError(`--kind ${f.kind} is not known; choose one of ${Object.keys(COEFFICIENT_KINDS).join(', ')}`, 'bad-kind');
  const plan = planOutputs(f, FORMATS);
  const loaded = await checkedTable(ctx, name, f);
  const t = loaded.table;
  const model = LeontiefModel.fromTable(t);
  let M: Matrix;
  if (kind === 'technical') M = model.A;
  else if (kind === 'total-requirements') M = model.inverse();
  else if (kind === 'allocation') M = allocationCoefficients(t);
  else M = GhoshModel.fromTable(t).inverse();
  const money = moneyUnit(t.meta);
  const unit = kind === 'technical' ? `${money} per ${money} of output` : kind === 'total-requirements' ? `${money} of output per ${money} of final demand` : kind === 'allocation' ? 'share of the row sector\'s output' : `${money} of output per ${money} of primary input`;
  const m: LabelledMatrix = { title: COEFFICIENT_KINDS[kind].title, about: COEFFICIENT_KINDS[kind].about, rows: t.sectors, cols: t.sectors, matrix: M, unit, corner: 'sector' };
  const report = () =>
    buildReport({
      ...reportBase(ctx, f),
      title: `${m.title}: ${t.meta.title ?? loaded.file.name}`,
      table: t,
      inputs: reportInputs(loaded),
      settings: [setting('kind', 'Matrix', kind, f.kind ? 'given' : 'default')],
      assumptions: modelAssumptions(t).filter((a) => !a.startsWith('No household') && !a.startsWith('Demand changes')),
      findings: loaded.checks,
      sections: [matrixSection({ id: `matrix-${kind}`, title: m.title, about: m.about, rows: t.sectors, cols: t.sectors, matrix: M, unit, corner: 'Sector' }), checksSection(loaded.checks)],
    });
  const about = { Table: t.meta.title ?? loaded.file.name, 'Table file': loaded.file.name, 'Table SHA-256': loaded.file.sha256, 'Money unit': money, Invented: t.meta.invented ? 'yes: invented data' : 'no', Cautions: CAUTION_LINE };
  const json = () => ({ kind, file: loaded.file.name, sha256: loaded.file.sha256, table: describeTable(t), ...matrixJson(m) });
  return deliver(
    ctx,
    {
      json,
      text: () => {
        const n = t.sectors.codes.length;
        if (n > 12) return `${tableLine(loaded)}\n${m.title}: ${n} × ${n}, in ${unit}. Write it with --out FILE.csv (or .xlsx, .json, .html).\n`;
        const w = 10;
        const head = ['', ...t.sectors.codes].map((c, j) => (j === 0 ? c.padEnd(8) : c.slice(0, w).padStart(w))).join(' ');
        const rows = t.sectors.codes.map((c, i) => [c.padEnd(8), ...Array.from(M.data.subarray(i * n, (i + 1) * n), (v) => v.toFixed(6).padStart(w))].join(' '));
        return `${tableLine(loaded)}\n${m.title} (${unit})\n${head}\n${rows.join('\n')}\n`;
      },
      writers: matrixWriters(m, report, about),
    },
    plan,
    f,
  );
}
