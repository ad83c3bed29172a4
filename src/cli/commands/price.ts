/** `ripplewise price TABLE`: the Leontief price model, costs passed on in full through the supply chain. */
import { LeontiefModel } from '../../../engine/leontief';
import type { PriceShock, ValueAddedChange } from '../../../engine/price';
import { PRICE_ABOUT, priceModel } from '../../../engine/price';
import { Checker } from '../../project/check';
import { parseJson } from '../../project/json';
import { buildReport, checksSection, describeTable, modelAssumptions, priceSection, setting } from '../../report/model';
import type { CommonFlags } from '../common';
import { checkedTable, numberOption, reportBase, reportInputs, reportWriters, tableLine } from '../common';
import type { CliContext } from '../context';
import { UsageError } from '../errors';
import type { InputFile } from '../files';
import { readInput, reportInput } from '../files';
import { list } from '../model-options';
import { deliver, planOutputs } from '../output';
import { CAUTION_LINE, fixed, textTable } from '../text';
import { FORMATS } from '../register/price';

export interface Flags extends CommonFlags {
  valueAddedPercent?: string;
  perUnit?: string;
  row?: string;
  sector?: string;
  importPrice?: string;
  shock?: string;
}

function shockFromFile(f: InputFile): PriceShock {
  const c = new Checker(f.name);
  const o = c.object(parseJson(new TextDecoder().decode(f.bytes), f.name), '');
  const shock: PriceShock = {};
  if (o.valueAdded !== undefined) {
    shock.valueAdded = c.array(o.valueAdded, 'valueAdded').map((x, i) => {
      const v = c.object(x, `valueAdded[${i}]`);
      const ch: ValueAddedChange = {};
      const sector = c.optString(v.sector, `valueAdded[${i}].sector`);
      const row = c.optString(v.row, `valueAdded[${i}].row`);
      const percent = c.optNumber(v.percent, `valueAdded[${i}].percent`);
      const perUnit = c.optNumber(v.perUnit, `valueAdded[${i}].perUnit`);
      if (sector !== undefined) ch.sector = sector;
      if (row !== undefined) ch.row = row;
      if (percent !== undefined) ch.percent = percent;
      if (perUnit !== undefined) ch.perUnit = perUnit;
      return ch;
    });
  }
  if (o.importPrice !== undefined) {
    shock.importPrice =
      typeof o.importPrice === 'number'
        ? c.number(o.importPrice, 'importPrice')
        : c.array(o.importPrice, 'importPrice').map((x, i) => {
            const v = c.object(x, `importPrice[${i}]`);
            return { sector: c.string(v.sector, `importPrice[${i}].sector`), percent: c.number(v.percent, `importPrice[${i}].percent`) };
          });
  }
  return shock;
}

function describeShock(s: PriceShock): string {
  const parts: string[] = [];
  for (const v of s.valueAdded ?? []) {
    const what = v.percent !== undefined ? `${v.percent} % rise of ${v.row ? `value-added row '${v.row}'` : 'value added'}` : `${v.perUnit} more ${v.row ? `'${v.row}' ` : 'value added '}per unit of output`;
    parts.push(`${what} in ${v.sector ? `'${v.sector}'` : 'every sector'}`);
  }
  if (typeof s.importPrice === 'number') parts.push(`imported inputs ${s.importPrice} % dearer in every sector`);
  else if (s.importPrice) parts.push(...s.importPrice.map((x) => `imported inputs ${x.percent} % dearer in '${x.sector}'`));
  return parts.length ? parts.join('; ') : 'none (base price indices only)';
}

export async function action(ctx: CliContext, name: string, f: Flags): Promise<number> {
  const plan = planOutputs(f, FORMATS);
  const pct = numberOption(f.valueAddedPercent, '--value-added-percent');
  const per = numberOption(f.perUnit, '--per-unit');
  const imp = numberOption(f.importPrice, '--import-price');
  if (pct !== undefined && per !== undefined) throw new UsageError('give --value-added-percent or --per-unit, not both', 'conflict');
  if ((f.row !== undefined || f.sector !== undefined) && pct === undefined && per === undefined) throw new UsageError('--row and --sector describe a value-added change: add --value-added-percent or --per-unit', 'missing-option');
  const loaded = await checkedTable(ctx, name, f);
  const t = loaded.table;
  let shockFile: InputFile | undefined;
  let shock: PriceShock = {};
  if (f.shock !== undefined) {
    if (pct !== undefined || per !== undefined || imp !== undefined) throw new UsageError('--shock cannot be combined with --value-added-percent, --per-unit or --import-price', 'conflict');
    shockFile = await readInput(ctx, f.shock, 'shock');
    shock = shockFromFile(shockFile);
  } else {
    if (pct !== undefined || per !== undefined) {
      const sectors = list(f.sector);
      const base: ValueAddedChange = pct !== undefined ? { percent: pct } : { perUnit: per! };
      if (f.row !== undefined) base.row = f.row;
      shock.valueAdded = sectors && sectors.length ? sectors.map((s) => ({ ...base, sector: s })) : [base];
    }
    if (imp !== undefined) shock.importPrice = imp;
  }
  const r = priceModel(t, LeontiefModel.fromTable(t), shock);
  const described = describeShock(shock);
  const report = () =>
    buildReport({
      ...reportBase(ctx, f),
      title: `Prices: ${t.meta.title ?? loaded.file.name}`,
      table: t,
      inputs: reportInputs(loaded, shockFile ? [reportInput(shockFile, 'shock')] : []),
      settings: [setting('shock', 'Price shock', described, 'given')],
      assumptions: modelAssumptions(t).filter((a) => !a.startsWith('No household') && !a.startsWith('Demand changes')),
      findings: [...loaded.checks, ...r.findings],
      sections: [priceSection(r, { shock: described }), checksSection(loaded.checks)],
    });
  return deliver(
    ctx,
    {
      json: () => ({
        about: PRICE_ABOUT,
        file: loaded.file.name,
        sha256: loaded.file.sha256,
        table: describeTable(t),
        shock: { ...shock, description: described },
        sectors: r.sectors.codes.map((code, j) => ({ code, label: r.sectors.labels[j]!, costChange: r.costChange[j]!, base: r.base[j]!, change: r.change[j]!, index: r.index[j]!, percent: r.percent[j]! })),
        units: { costChange: 'per unit of output', base: 'index, 1 in the table year', change: 'index points', index: 'index', percent: '%' },
        findings: r.findings,
        cautions: r.cautions,
      }),
      text: () =>
        [
          tableLine(loaded),
          `Shock: ${described}`,
          '',
          textTable(
            [{ label: 'code' }, { label: 'sector' }, { label: 'base', align: 'right' }, { label: 'change', align: 'right' }, { label: 'rise %', align: 'right' }],
            r.sectors.codes.map((c, j) => [c, r.sectors.labels[j]!.slice(0, 40), fixed(r.base[j], 4), fixed(r.change[j], 5), fixed(r.percent[j], 3)]),
          ),
          ...r.findings.map((x) => `${x.severity}: ${x.message}`),
          CAUTION_LINE,
          '',
        ].join('\n'),
      writers: reportWriters(report),
    },
    plan,
    f,
  );
}
