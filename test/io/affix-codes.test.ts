/**
 * Rule affix-codes and code with label in one cell (src/io/rules/affix-codes.ts): each class of
 * layout from test/helpers/affix-layouts.ts (invented numbers, layout only) must give its table
 * back exactly, with the reason in the mapping, and again with the mapping it reported. The
 * classes are those the issue names: domestic rows DOM_xx against columns Dxx, a suffix on one
 * axis, "code: label" and "code - label" cells, and a domestic block followed by an imported block
 * of the same products (read as imports by product, as agencies that separate domestic and
 * imported use mean it: common practice).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../engine/errors';
import { gridFromRows } from '../../src/io/grid';
import { parseMapping } from '../../src/io/mapping';
import { readTable } from '../../src/io/tables';
import { AFFIX_CLASSES, affixLayout, affixTable, importsOf, type AffixTable } from '../helpers/affix-layouts';

function expectTable(t: AffixTable, r: ReturnType<typeof readTable>, what: string): void {
  const n = t.codes.length;
  expect(r.table.sectors.codes, what).toEqual(t.codes);
  expect(r.table.sectors.labels, what).toEqual(t.labels);
  expect(Array.from(r.table.Z.data), what).toEqual(t.Z.flat());
  expect(r.table.finalDemand.codes, what).toEqual(t.fdCodes);
  expect(r.table.finalDemand.labels, what).toEqual(t.fdLabels);
  expect(Array.from(r.table.F.data), what).toEqual(t.F.flat());
  expect(r.table.valueAdded.codes, what).toEqual(t.vaCodes);
  expect(Array.from(r.table.V.data), what).toEqual(t.V.flat());
  expect(Array.from(r.table.x), what).toEqual(t.x);
  expect(Array.from(r.table.imports ?? []), what).toEqual(importsOf(t));
  expect(r.table.sectors.codes.length).toBe(n);
}

describe('rule affix-codes: row and column codes that differ by an affix, code and label in one cell', () => {
  for (const cls of AFFIX_CLASSES) {
    it(`${cls}: the table comes back exactly, with the reason, and again with the mapping it reported`, () => {
      for (const [n, seed, style] of [
        [3, 1, 'digits'],
        [5, 2, 'letters'],
        [9, 3, 'digits'],
        [12, 4, 'digits'],
      ] as const) {
        const t = affixTable(n, seed, style);
        const what = `${cls}, ${n} sectors, ${style}`;
        const g = gridFromRows(affixLayout(t, cls), `${cls}.csv`);
        const r = readTable(g);
        expectTable(t, r, what);
        expect(r.findings.filter((f) => f.severity !== 'note').map((f) => f.message), what).toEqual([]);
        if (cls !== 'colon-cells') {
          // Codes that differ: the note and every sector's why name the rule.
          expect(r.findings.find((f) => f.code === 'affix-codes')?.message, what).toMatch(/affix/);
          for (const row of r.mapping.rows.filter((x) => x.role === 'sector')) expect(row.why, what).toMatch(/rule affix-codes/);
          for (const col of r.mapping.columns.filter((x) => x.role === 'sector')) expect(col.why, what).toMatch(/rule affix-codes/);
        }
        if (cls === 'dom-imp' || cls === 'dom-imp-colon') {
          const imp = r.mapping.rows.filter((x) => x.role === 'imports');
          expect(imp.map((x) => x.code), what).toEqual(t.codes.map((c) => `IMP_${c}`));
          for (const x of imp) expect(x.why, what).toMatch(/imported use of product/);
          expect(r.findings.some((f) => f.code === 'imports-summed'), what).toBe(true);
        }
        const again = readTable(g, { mapping: r.mapping });
        expectTable(t, again, `${what}, with its mapping`);
      }
    });
  }

  it('the mapping can turn the rule off (affixCodes: false), and the rows then have no columns', () => {
    const t = affixTable(4, 9);
    const g = gridFromRows(affixLayout(t, 'prefix'), 'prefix.csv');
    let err: unknown;
    try {
      readTable(g, { mapping: { affixCodes: false } });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).code).toBe('row-without-column');
    expect((err as InputError).message).toMatch(/DOM_01/);
  });

  it('products and industries numbered alike, with labels that differ, are not matched (two classifications)', () => {
    const t = affixTable(5, 13);
    const rows = affixLayout(t, 'prefix');
    // The label row (4th line) says products where the rows say industries.
    rows[3] = rows[3]!.map((c, j) => (j >= 2 && j < 2 + t.codes.length ? `Products of ${String(c).toLowerCase()}` : c));
    let err: unknown;
    try {
      readTable(gridFromRows(rows, 'products.csv'));
    } catch (e) {
      err = e;
    }
    expect((err as InputError).code).toBe('row-without-column');
  });

  it('codes that already match are left alone (no affix note)', () => {
    const t = affixTable(6, 5);
    const r = readTable(gridFromRows(affixLayout(t, 'colon-cells'), 'same.csv'));
    expect(r.findings.some((f) => f.code === 'affix-codes')).toBe(false);
    expectTable(t, r, 'colon-cells');
  });
});

describe('a mapping can rename codes (rename: { from: to })', () => {
  const t = affixTable(4, 11);
  const g = () => gridFromRows(affixLayout(t, 'prefix'), 'prefix.csv');
  const rename: Record<string, string> = {};
  for (const c of t.codes) {
    rename[`DOM_${c}`] = c;
    rename[`D${c}`] = c;
  }
  rename.HH = 'P3_S14';

  it('renames rows and columns of any role before the rules read them, and says so in the why', () => {
    const r = readTable(g(), { mapping: { affixCodes: false, rename } });
    expect(r.table.sectors.codes).toEqual(t.codes);
    expect(Array.from(r.table.Z.data)).toEqual(t.Z.flat());
    expect(Array.from(r.table.x)).toEqual(t.x);
    expect(r.table.finalDemand.codes).toEqual(['P3_S14', ...t.fdCodes.slice(1)]);
    expect(r.findings.some((f) => f.code === 'affix-codes')).toBe(false);
    const row = r.mapping.rows.find((x) => x.code === t.codes[0])!;
    expect(row.why).toMatch(/code 'DOM_01' renamed '01' by the mapping/);
    expect(r.mapping.columns.find((x) => x.code === 'P3_S14')!.why).toMatch(/renamed/);
    expect(r.mapping.rename).toEqual(rename);
    // The reported mapping read back gives the same table.
    const again = readTable(g(), { mapping: parseMapping(JSON.stringify(r.mapping)) });
    expect(Array.from(again.table.Z.data)).toEqual(t.Z.flat());
    expect(again.table.finalDemand.codes).toEqual(r.table.finalDemand.codes);
  });

  it('a code that names no row or column is an error naming the file and the code', () => {
    let err: unknown;
    try {
      readTable(g(), { mapping: { rename: { DOM_99: '99' } } });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).code).toBe('mapping-unknown-code');
    expect((err as InputError).message).toMatch(/prefix\.csv.*'DOM_99'/);
  });

  it('a rename that is not an object of texts is a mapping error', () => {
    expect(() => parseMapping('{"rename": {"A": 3}}', 'm.json')).toThrow(/m\.json: rename must be an object/);
    expect(() => parseMapping('{"rename": ["A"]}', 'm.json')).toThrow(/rename must be/);
  });
});
