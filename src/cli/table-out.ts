/** Writers for a whole table (convert, aggregate), all through src/io's table writers, plus an HTML report. */
import type { Table } from '../../engine/table';
import { moneyUnit } from '../../engine/table';
import { writeTableCsv, writeTableJson, writeTableXlsx } from '../io/index';
import type { Report } from '../report/model';
import type { OutputFormat } from './files';
import type { Writer } from './output';

export function tableWriters(t: Table, report: () => Report, o: { coefficients?: boolean } = {}): Partial<Record<OutputFormat, Writer>> {
  return {
    csv: () => writeTableCsv(t),
    tsv: () => writeTableCsv(t, { delimiter: '\t' }),
    xlsx: () => writeTableXlsx(t, { coefficients: o.coefficients === true }),
    json: () => writeTableJson(t, 1) + '\n',
    html: async () => (await import('../report/html')).writeHtml(report()),
  };
}

/** A table's plain description for --json. */
export function tableJson(t: Table) {
  return {
    title: t.meta.title ?? null,
    sectors: t.sectors,
    finalDemand: t.finalDemand,
    valueAdded: t.valueAdded,
    satellites: t.satellites.map((s) => ({ code: s.code, label: s.label, unit: s.unit })),
    imports: t.imports !== undefined,
    moneyUnit: moneyUnit(t.meta),
    invented: t.meta.invented === true,
    totalOutput: Array.from(t.x).reduce((a, b) => a + b, 0),
  };
}
