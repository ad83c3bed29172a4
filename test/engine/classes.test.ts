import { describe, expect, it } from 'vitest';
import { makeTable, toPlain, valueAddedMeasure, aggregate } from '../../engine';
import { readTableJson, writeTableJson } from '../../src/io';

// Value added at basic prices is compensation of employees + operating surplus and mixed income
// + other taxes less subsidies on production; imports and taxes less subsidies on products are
// primary inputs but not value added (common practice; 2008 SNA, ch. 6 and 14).
const plain = {
  sectors: { codes: ['A', 'B'] },
  Z: [
    [10, 20],
    [30, 5],
  ],
  finalDemand: { codes: ['HH', 'EXP'], classes: ['households' as const, 'exports' as const], values: [[60, 10], [40, 25]] },
  valueAdded: {
    codes: ['COE', 'GOS', 'TPRD', 'IMP'],
    classes: ['compensation' as const, 'operating-surplus' as const, 'product-taxes' as const, 'imports' as const],
    values: [
      [30, 20],
      [15, 10],
      [5, 5],
      [10, 40],
    ],
  },
};

describe('classes of primary inputs and final-demand columns', () => {
  it('value added sums only the rows classed as value added (common practice)', () => {
    const t = makeTable(plain);
    const va = valueAddedMeasure(t);
    expect(va.from).toEqual(['COE', 'GOS']);
    expect(va.coefficients[0]).toBeCloseTo(45 / 100, 15);
    expect(va.coefficients[1]).toBeCloseTo(30 / 100, 15);
    expect(va.about).toMatch(/'TPRD', 'IMP' are not value added/);
  });

  it('a row without a class counts as value added, as before classes existed', () => {
    const t = makeTable({ ...plain, valueAdded: { ...plain.valueAdded, classes: undefined } });
    expect(valueAddedMeasure(t).from).toEqual(['COE', 'GOS', 'TPRD', 'IMP']);
    const u = makeTable({ ...plain, valueAdded: { ...plain.valueAdded, classes: ['compensation', null, 'imports', null] } });
    expect(valueAddedMeasure(u).from).toEqual(['COE', 'GOS', 'IMP']);
  });

  it('rows named explicitly are used whatever their class', () => {
    const t = makeTable(plain);
    expect(valueAddedMeasure(t, ['COE', 'IMP']).from).toEqual(['COE', 'IMP']);
  });

  it('an unknown class or a list of the wrong length is an error naming it', () => {
    expect(() => makeTable({ ...plain, valueAdded: { ...plain.valueAdded, classes: ['wages' as never, null, null, null] } })).toThrow(/'COE' has the class 'wages'/);
    expect(() => makeTable({ ...plain, valueAdded: { ...plain.valueAdded, classes: ['compensation'] } })).toThrow(/4 value-added codes but 1 classes/);
  });

  it('classes travel through the plain form, JSON and aggregation', () => {
    const t = makeTable(plain);
    expect(toPlain(t).valueAdded!.classes).toEqual(plain.valueAdded.classes);
    const back = readTableJson(writeTableJson(t));
    expect(back.valueAdded.classes).toEqual(plain.valueAdded.classes);
    expect(back.finalDemand.classes).toEqual(['households', 'exports']);
    const g = aggregate(t, { from: ['A', 'B'], to: ['G', 'G'] });
    expect(g.valueAdded.classes).toEqual(plain.valueAdded.classes);
  });
});
