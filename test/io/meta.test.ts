/**
 * Units and scale read from title lines, in the ways agencies write them (common practice:
 * "millions of dollars", "USD million", "$ thousand", "'000", "EUR bn").
 */
import { describe, expect, it } from 'vitest';
import { metaFromTitles } from '../../src/io/layout';

describe('metaFromTitles', () => {
  it.each([
    ['Use table, 2017, millions of dollars at producers’ prices', 1e6, 'dollars', 2017, "producers' prices"],
    ['Input-output table 2020, USD million, basic prices', 1e6, 'USD', 2020, 'basic prices'],
    ['Table 5. Flows between industries ($ thousand)', 1e3, '$', undefined, undefined],
    ["Symmetric table ('000 euros), 2019", 1e3, 'euro', 2019, undefined],
    ['Flows in EUR bn, purchasers prices', 1e9, 'EUR', undefined, 'purchasers prices'],
  ])('%s', (title, scale, currency, year, price) => {
    const m = metaFromTitles([title]);
    expect(m.scale).toBe(scale);
    expect(m.currency).toBe(currency);
    expect(m.year).toBe(year);
    expect(m.priceBasis).toBe(price);
  });

  it('leaves the scale unset when the title names none', () => {
    expect(metaFromTitles(['Flows between industries']).scale).toBeUndefined();
  });
});
