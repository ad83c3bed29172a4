/** `ripplewise convert TABLE --out FILE`: read a table in any layout src/io reads, write it as CSV, TSV, XLSX or JSON (read back identically). */
import { coefficients } from '../../../engine/table';
import { buildReport, checksSection, matrixSection, setting } from '../../report/model';
import type { CommonFlags } from '../common';
import { reportBase, reportInputs, tableLine } from '../common';
import { checks } from '../../../engine/checks';
import type { CliContext } from '../context';
import { UsageError } from '../errors';
import { deliver, planOutputs } from '../output';
import { InputError } from '../../../engine/errors';
import { detectLayout, guessShape, readGrid } from '../../io/index';
import { readInput } from '../files';
import { loadTable, sheetOption } from '../table-input';
import { tableJson, tableWriters } from '../table-out';
import { moneyUnit } from '../../../engine/table';
import { FORMATS } from '../register/convert';

export interface Flags extends CommonFlags {
  coefficients?: boolean;
  printMapping?: boolean;
}

/**
 * --print-mapping: the detected layout, always. When reading the table then fails, the layout is
 * still printed (detected without reading the cells), with the error and the role to change, and
 * the error is raised after it (so the exit code says the read failed).
 */
async function printMappingAlways(ctx: CliContext, name: string, f: Flags): Promise<number> {
  try {
    const loaded = await loadTable(ctx, name, f);
    ctx.stdout.write(JSON.stringify(loaded.mapping ?? null, null, 2) + '\n');
    return 0;
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    let detected: { mapping?: unknown; findings?: unknown[] } = {};
    try {
      const file = await readInput(ctx, name, 'table');
      const { grid } = await readGrid(file.bytes, { file: name, ...(f.sheet !== undefined ? { sheet: sheetOption(f.sheet)! } : {}) });
      if ((f.shape ?? guessShape(grid)) === 'wide') detected = detectLayout(grid);
    } catch (e2) {
      detected = { findings: [{ code: (e2 as InputError).code ?? 'error', severity: 'error', message: (e2 as Error).message }] };
    }
    const sector = (e.where as { sector?: string } | undefined)?.sector;
    const change = sector ? `set the role of '${sector}' in the mapping's rows or columns (for example "rows": { "${sector}": "ignore" }), or fix the file` : 'edit the roles in this mapping and pass it back with --mapping';
    const out = { ...((detected.mapping as object) ?? { format: 'ripplewise-layout', version: 1 }), findings: detected.findings ?? [], error: { code: e.code, message: e.message, change } };
    ctx.stdout.write(JSON.stringify(out, null, 2) + '\n');
    throw e;
  }
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  if (f.printMapping && (f.out?.length || f.format || f.json)) throw new UsageError('--print-mapping prints the layout alone: leave out --out, --format and --json', 'conflict');
  const plan = planOutputs(f, FORMATS);
  if (f.printMapping) return printMappingAlways(ctx, name, f);
  const loaded = await loadTable(ctx, name, f);
  const t = loaded.table;
  if (f.printMapping) {
    ctx.stdout.write(JSON.stringify(loaded.mapping ?? null, null, 2) + '\n');
    return 0;
  }
  const found = [...loaded.findings, ...checks(t)];
  const report = () =>
    buildReport({
      ...reportBase(ctx, f),
      title: t.meta.title ?? loaded.file.name,
      table: t,
      inputs: reportInputs(loaded),
      settings: [setting('shape', 'Layout read', loaded.shape ?? 'detected', f.shape ? 'given' : 'guessed')],
      assumptions: [],
      findings: found,
      sections: [
        matrixSection({ id: 'flows', title: 'Intermediate flows Z', about: 'What each sector (column) buys from each sector (row).', rows: t.sectors, cols: t.sectors, matrix: t.Z, unit: moneyUnit(t.meta), style: 'amount', sheet: 'Flows' }),
        matrixSection({ id: 'coefficients', title: 'Technical coefficients A', about: 'Inputs from each sector (row) per unit of output of each sector (column).', rows: t.sectors, cols: t.sectors, matrix: coefficients(t), unit: `${moneyUnit(t.meta)} per ${moneyUnit(t.meta)} of output`, sheet: 'Coefficients' }),
        checksSection(found),
      ],
    });
  return deliver(
    ctx,
    {
      json: () => ({ file: loaded.file.name, sha256: loaded.file.sha256, shape: loaded.shape ?? null, table: tableJson(t), mapping: loaded.mapping ?? null, findings: loaded.findings }),
      text: () => `${tableLine(loaded)}\nRead as ${loaded.shape ?? 'a table'}; write it with --out FILE.csv, .tsv, .xlsx, .json or .html.\n`,
      writers: tableWriters(t, report, { coefficients: f.coefficients === true }),
    },
    plan,
    f,
  );
}
