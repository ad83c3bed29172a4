/** `ripplewise balance TABLE --row-totals FILE --column-totals FILE [--method ras|gras] --out FILE`: a table scaled to new totals. */
import type { BalanceMethod } from '../../../engine/regional/index';
import { GRAS_ABOUT, RAS_ABOUT, gras, ras } from '../../../engine/regional/index';
import { moneyUnit } from '../../../engine/table';
import { buildReport, checksSection, matrixSection, setting } from '../../report/model';
import { balanceSection } from '../../report/regional';
import type { CommonFlags } from '../common';
import { checkedTable, numberOption, reportBase, reportInputs, tableLine } from '../common';
import type { CliContext } from '../context';
import { styles, useColour } from '../context';
import { EXIT_CHECKS, UsageError } from '../errors';
import { reportInput } from '../files';
import { matrixJson, matrixWriters } from '../matrix-out';
import type { LabelledMatrix } from '../matrix-out';
import { deliver, planOutputs } from '../output';
import { progress } from '../progress';
import { pickColumn, readValues } from '../regional-input';
import { balancePart, balancedTable } from '../balance-part';
import type { BalancePartName } from '../balance-part';
import type { ValueColumn, ValuesRead } from '../regional-input';
import { CAUTION_LINE, terminalSafe } from '../text';
import { FORMATS } from '../register/balance';
import { tableJson, tableWriters } from '../table-out';

export interface Flags extends CommonFlags {
  rowTotals?: string;
  columnTotals?: string;
  rowTotalsColumn?: string;
  columnTotalsColumn?: string;
  method?: string;
  part?: string;
  fix?: string[];
  write?: string;
  tolerance?: string;
  maxIterations?: string;
}

function oneColumn(read: ValuesRead, given: string | undefined, option: string): ValueColumn {
  if (given) return pickColumn(read.columns, given, option, read.file.name);
  return read.columns[0]!;
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  const part = (f.part ?? 'intermediate').toLowerCase() as BalancePartName;
  const write = (f.write ?? 'matrix').toLowerCase();
  if (write !== 'matrix' && write !== 'table') throw new UsageError(`--write must be matrix or table; got '${f.write}'`, 'bad-write');
  if (part !== 'intermediate' && part !== 'whole') throw new UsageError(`--part must be intermediate or whole; got '${f.part}'`, 'bad-part');
  const given = f.method?.toLowerCase();
  if (given !== undefined && given !== 'ras' && given !== 'gras') throw new UsageError(`--method must be ras or gras; got '${f.method}'`, 'bad-method');
  const tolerance = numberOption(f.tolerance, '--tolerance', { min: 1e-16, max: 0.1 }) ?? 1e-10;
  const maxIterations = numberOption(f.maxIterations, '--max-iterations', { min: 1, max: 1e7, integer: true }) ?? 10000;
  if (!f.rowTotals || !f.columnTotals) throw new UsageError('balance needs --row-totals FILE and --column-totals FILE', 'missing-option');
  const plan = planOutputs(f, FORMATS);
  const loaded = await checkedTable(ctx, name, f, { allowErrors: true });
  const t = loaded.table;
  const { rows, cols, A } = balancePart(t, part);
  const rowRead = await readValues(ctx, f.rowTotals, 'row totals', rows);
  const colRead = await readValues(ctx, f.columnTotals, 'column totals', cols);
  const u = oneColumn(rowRead, f.rowTotalsColumn, '--row-totals-column').values;
  const v = oneColumn(colRead, f.columnTotalsColumn, '--column-totals-column').values;
  let fixed: Uint8Array | undefined;
  for (const spec of f.fix ?? []) {
    const m = /^([^:]+):(.+)$/.exec(spec.trim());
    if (!m) throw new UsageError(`--fix '${spec}' must be ROW:COLUMN, two codes`, 'bad-fix');
    const i = rows.codes.indexOf(m[1]!.trim());
    const j = cols.codes.indexOf(m[2]!.trim());
    if (i < 0) throw new UsageError(`--fix '${spec}': there is no row '${m[1]}' in the ${part} part`, 'bad-fix', `Rows: ${rows.codes.slice(0, 12).join(', ')}${rows.codes.length > 12 ? ', …' : ''}`);
    if (j < 0) throw new UsageError(`--fix '${spec}': there is no column '${m[2]}' in the ${part} part`, 'bad-fix', `Columns: ${cols.codes.slice(0, 12).join(', ')}${cols.codes.length > 12 ? ', …' : ''}`);
    fixed ??= new Uint8Array(A.rows * A.cols);
    fixed[i * A.cols + j] = 1;
  }
  const hasNegative = A.data.some((x) => x < 0);
  const method: BalanceMethod = (given as BalanceMethod | undefined) ?? (hasNegative ? 'gras' : 'ras');
  const bar = await progress(ctx, method.toUpperCase(), maxIterations, { json: !!f.json });
  let result;
  try {
    const o = { tolerance, maxIterations, rowCodes: rows.codes, colCodes: cols.codes, ...(fixed ? { fixed } : {}), onIteration: (k: number) => bar.update(k, maxIterations) };
    result = method === 'gras' ? gras(A, u, v, o) : ras(A, u, v, o);
  } finally {
    bar.stop();
  }
  const found = [...loaded.checks, ...rowRead.findings, ...colRead.findings, ...result.findings];
  const summary = () => ({ file: loaded.file.name, sha256: loaded.file.sha256, method, part, iterations: result.iterations, converged: result.converged, maxDeviation: result.maxDeviation, worst: result.worst, tolerance, infeasible: result.infeasible });
  if (!result.converged) {
    // Nothing is written: a table that misses its totals is not the table asked for.
    const s = styles(useColour(ctx, ctx.stderr));
    ctx.stderr.write(`${s.red('error:')} ${terminalSafe(`${method.toUpperCase()} could not meet the totals of ${rowRead.file.name} and ${colRead.file.name}; nothing was written`)}\n`);
    for (const x of result.findings) ctx.stderr.write(`  ${s.red('error')}   ${terminalSafe(x.message)}\n`);
    return deliver(ctx, { json: () => ({ ...summary(), findings: found }), text: () => '', writers: {}, exitCode: EXIT_CHECKS }, [], { ...(f.json ? { json: true } : {}) });
  }
  const unit = moneyUnit(t.meta);
  const whole = write === 'table' ? balancedTable(t, part, result.X, method) : undefined;
  const lm: LabelledMatrix = { title: `${part === 'whole' ? 'table' : 'intermediate flows'} balanced by ${method.toUpperCase()}`, about: method === 'gras' ? GRAS_ABOUT : RAS_ABOUT, rows, cols, matrix: result.X, unit, corner: part === 'whole' ? 'row/column' : 'sector' };
  const settings = [
    setting('method', 'Method', method.toUpperCase(), given ? 'given' : 'guessed', given ? undefined : hasNegative ? 'the part has negative entries' : 'the part has no negative entries'),
    setting('part', 'Part balanced', part, f.part ? 'given' : 'default'),
    setting('tolerance', 'Relative tolerance', tolerance, f.tolerance ? 'given' : 'default'),
    setting('write', 'Written', write === 'table' ? 'the whole table with the balanced part in place' : 'the balanced part', f.write ? 'given' : 'default'),
    setting('fixed', 'Cells held fixed', (f.fix ?? []).join(', ') || 'none', f.fix?.length ? 'given' : 'default'),
  ];
  const report = () =>
    buildReport({
      ...reportBase(ctx, f),
      title: `Balanced by ${method.toUpperCase()}: ${t.meta.title ?? loaded.file.name}`,
      table: t,
      inputs: reportInputs(loaded, [reportInput(rowRead.file, 'row totals'), reportInput(colRead.file, 'column totals')]),
      settings,
      assumptions: ['Scaling keeps the structure of the old table wherever the new totals do not say otherwise.'],
      findings: found,
      sections: [balanceSection(result, rows, cols), matrixSection({ id: 'balanced', title: 'The balanced matrix', about: lm.about, rows, cols, matrix: result.X, unit, style: 'amount', sheet: 'Balanced' }), checksSection(found)],
    });
  return deliver(
    ctx,
    {
      json: () => ({ about: lm.about, ...summary(), matrix: matrixJson(lm), ...(whole ? { table: tableJson(whole) } : {}), findings: found }),
      text: (colour) => {
        const s = styles(colour);
        return [tableLine(loaded), `${method.toUpperCase()} on the ${part} part (${rows.codes.length} × ${cols.codes.length}): converged in ${result.iterations} iterations; largest remaining relative deviation ${result.maxDeviation.toExponential(2)} (${result.worst.axis} '${result.worst.code}')`, s.dim(whole ? 'Give --out FILE to write the table with the balanced part in place (CSV, TSV, XLSX, JSON) or a report (HTML).' : 'Give --out FILE to write the balanced matrix (CSV, TSV, XLSX, JSON) or a report (HTML); --write table writes the whole table.'), s.dim(CAUTION_LINE), ''].join('\n');
      },
      writers: whole ? tableWriters(whole, report) : matrixWriters(lm, report, { method: method.toUpperCase(), iterations: String(result.iterations), 'largest relative deviation': result.maxDeviation.toExponential(3) }),
    },
    plan,
    f,
  );
}
