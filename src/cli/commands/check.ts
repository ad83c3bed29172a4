/** `ripplewise check TABLE`: the checks of a table (balances, productivity, singularity, conditioning); exit 1 when any fails. */
import { checks } from '../../../engine/checks';
import type { Finding } from '../../../engine/findings';
import { hasErrors, sortFindings } from '../../../engine/findings';
import { LeontiefModel } from '../../../engine/leontief';
import { moneyUnit } from '../../../engine/table';
import { crossCheckPublished, sniffFile } from '../../io/index';
import { buildReport, checksSection, describeTable } from '../../report/model';
import type { CommonFlags } from '../common';
import { numberOption, reportBase, reportInputs, reportWriters, tableLine } from '../common';
import { styles } from '../context';
import { EXIT_CHECKS } from '../errors';
import { deliver, planOutputs } from '../output';
import { loadTable } from '../table-input';
import { findingsText } from '../text';
import { CHECK_ABOUT } from '../register/check';

export interface Flags extends CommonFlags {
  balanceTolerance?: string;
  conditionLimit?: string;
}

/**
 * The agency's own published inverse and multipliers in the same workbook, compared with ours
 * (src/io/published.ts). Workbooks only, and tables small enough to invert whole.
 */
async function publishedFindings(loaded: Awaited<ReturnType<typeof loadTable>>): Promise<Finding[]> {
  const t = loaded.table;
  if (loaded.shape !== 'wide' || sniffFile(loaded.file.bytes, loaded.file.name) !== 'xlsx' || t.sectors.codes.length > 3000) return [];
  let L;
  try {
    L = LeontiefModel.fromTable(t).inverse();
  } catch {
    return []; // a singular I − A is reported by the checks themselves
  }
  const sheet = (loaded.mapping as { sheet?: string } | undefined)?.sheet;
  return (await crossCheckPublished(loaded.file.bytes, loaded.file.name, t, L, sheet)).findings;
}

export async function action(ctx: import('../context').CliContext, name: string, f: Flags): Promise<number> {
  const plan = planOutputs(f, ['json', 'html', 'xlsx', 'csv']);
  const balanceTolerance = numberOption(f.balanceTolerance, '--balance-tolerance', { min: 0 });
  const conditionLimit = numberOption(f.conditionLimit, '--condition-limit', { min: 1 });
  const loaded = await loadTable(ctx, name, f);
  const t = loaded.table;
  const published = await publishedFindings(loaded);
  const found: Finding[] = sortFindings([
    ...loaded.findings,
    ...published,
    ...checks(t, { ...(balanceTolerance !== undefined ? { balanceTolerance } : {}), ...(conditionLimit !== undefined ? { conditionLimit } : {}) }),
  ]);
  const failed = hasErrors(found);
  const report = () =>
    buildReport({
      ...reportBase(ctx, f),
      title: `Checks of ${t.meta.title ?? loaded.file.name}`,
      table: t,
      inputs: reportInputs(loaded),
      settings: [],
      assumptions: [],
      findings: found,
      sections: [checksSection(found)],
    });
  const count = (s: string) => found.filter((x) => x.severity === s).length;
  return deliver(
    ctx,
    {
      json: () => ({
        about: CHECK_ABOUT,
        file: loaded.file.name,
        sha256: loaded.file.sha256,
        table: describeTable(t),
        moneyUnit: moneyUnit(t.meta),
        passed: !failed,
        errors: count('error'),
        warnings: count('warning'),
        notes: count('note'),
        findings: found,
      }),
      text: (colour) => {
        const s = styles(colour);
        const head = `${tableLine(loaded)}\n${failed ? s.red('FAILED') : s.green('passed')}: ${count('error')} errors, ${count('warning')} warnings, ${count('note')} notes\n`;
        return `${head}${found.length ? `${findingsText(found, colour)}\n` : ''}`;
      },
      writers: reportWriters(report),
      exitCode: failed ? EXIT_CHECKS : 0,
    },
    plan,
    f,
  );
}
