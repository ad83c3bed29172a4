/** `ripplewise check TABLE`: the checks of a table (balances, productivity, singularity, conditioning); exit 1 when any fails. */
import type { Command } from 'commander';
import { checks } from '../../../engine/checks';
import type { Finding } from '../../../engine/findings';
import { hasErrors, sortFindings } from '../../../engine/findings';
import { LeontiefModel } from '../../../engine/leontief';
import { moneyUnit } from '../../../engine/table';
import { crossCheckPublished, sniffFile } from '../../io/index';
import { buildReport, checksSection, describeTable } from '../../report/model';
import type { CommonFlags } from '../common';
import { examples, numberOption, outputOptions, reportBase, reportInputs, reportWriters, tableLine, tableOptions } from '../common';
import { styles } from '../context';
import { EXIT_CHECKS } from '../errors';
import type { Action } from '../main';
import { deliver, planOutputs } from '../output';
import { loadTable } from '../table-input';
import { findingsText } from '../text';

interface Flags extends CommonFlags {
  balanceTolerance?: string;
  conditionLimit?: string;
}

export const CHECK_ABOUT = 'The checks of a table: balances of rows and columns, productivity (Hawkins–Simon), singularity and conditioning of I − A.';

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p.command('check')
    .summary('Check a table: balances, productivity, singularity, conditioning').argument('<table>', "the table: .json, .csv, .tsv or .xlsx ('-' for standard input)").description(`${CHECK_ABOUT} Exit code 1 when a check fails.`);
  tableOptions(cmd);
  cmd.option('--balance-tolerance <ratio>', 'relative tolerance of the row and column balances (default 1e-4)');
  cmd.option('--condition-limit <number>', 'warn when the condition estimate of I − A is above this (default 1e10)');
  outputOptions(cmd, ['json', 'html', 'xlsx', 'csv'], { locale: true });
  examples(cmd, [
    ['ripplewise check table.csv', 'print the findings; exit 1 when a check fails'],
    ['ripplewise check table.xlsx --sheet IO --json', 'the findings as JSON'],
    ['ripplewise check - --input-format csv < table.csv', 'read standard input'],
    ['ripplewise check table.csv --out checks.html', 'a report of the checks'],
  ]);
  cmd.action((table: string, f: Flags) => run((ctx) => action(ctx, table, f), !!f.json));
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

async function action(ctx: import('../context').CliContext, name: string, f: Flags): Promise<number> {
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
