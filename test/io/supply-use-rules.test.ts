/**
 * Supply-use reading rules (invented tables; the agency case is in bea.test.ts): use-table
 * columns that are not industries of the make table are final demand, with a note; the scrap
 * commodity is proposed from its title or from the make table's structure.
 */
import { describe, expect, it } from 'vitest';
import { readLongCsv, readSupplyUse } from '../../src/io';
import { proposeScrap } from '../../src/io/rules/scrap';

describe('supply-use rules', () => {
  it('reads use-table columns with numeric codes that are no industry of the make table as final demand', () => {
    // Invented: two industries (1100, 2100) making two commodities; the use table adds 9100 (a final use).
    const make = readLongCsv('industry,commodity,value\n1100,1100,100\n2100,2100,80\n2100,1100,5\n', { file: 'make.csv' });
    const use = readLongCsv('commodity,industry,value\n1100,1100,10\n1100,2100,20\n2100,1100,15\n2100,2100,5\n1100,9100,75\n2100,9100,60\n', { file: 'use.csv' });
    const su = readSupplyUse(make, use, { scrap: 'none' });
    expect(su.input.industries.codes).toEqual(['1100', '2100']);
    expect(su.finalDemand.axis.codes).toEqual(['9100']);
    expect(Array.from(su.finalDemand.F.data)).toEqual([75, 60]);
    expect(su.findings.find((f) => f.code === 'use-columns-final-demand')?.message).toMatch(/'9100'/);
  });

  it('proposes scrap by title, else by structure (made by many, the main product of none)', () => {
    const codes = ['A', 'B', 'C', 'S'];
    // 4 industries × 4 commodities; S is made by three industries as a by-product.
    const make = Float64Array.from([10, 0, 0, 1, 0, 10, 0, 1, 0, 0, 10, 1, 1, 1, 1, 0]);
    expect(proposeScrap({ codes, labels: codes }, make, 4)).toMatchObject({ code: 'S', rule: 'structure' });
    expect(proposeScrap({ codes, labels: ['Farming', 'Mining', 'Factories', 'Used and second-hand goods'] }, make, 4)).toMatchObject({ code: 'S', rule: 'label' });
    // No by-product made widely: nothing proposed.
    expect(proposeScrap({ codes, labels: codes }, Float64Array.from([10, 0, 0, 0, 0, 10, 0, 0, 0, 0, 10, 0, 0, 0, 0, 10]), 4)).toBeUndefined();
  });
});
