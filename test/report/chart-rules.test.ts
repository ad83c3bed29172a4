/**
 * The charts' shared rules: one significant-digit rule for every number, axis titles at their
 * axes with units, a legend key for every colour, and point labels that never overlap.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fractionDigits, groupFormat, groupedBars, histogram, linkageQuadrant, numberFormat, overlaps, percentileBands, placeLabels, stackedBars, tickDigits, tornado } from '../../src/report/charts';

describe('one rule for significant digits', () => {
  it('gives the largest number of a group four significant digits, the same decimals for all (the issue: 2.29 beside 2.208)', () => {
    const f = groupFormat([2.29, 2.208, 1.05], 'en-GB');
    expect([f(2.29), f(2.208), f(1.05)]).toEqual(['2.290', '2.208', '1.050']);
    // The whole part is never rounded: 12,345.6 → 12,346 (0 decimals).
    expect(groupFormat([12345.6, 3.2], 'en-GB')(12345.6)).toBe('12,346');
    expect(groupFormat([12345.6, 3.2], 'en-GB')(3.2)).toBe('3');
    // Small coefficients: 0.4123 gives four decimals; the cap is six.
    expect(fractionDigits([0.4123, 0.0012])).toBe(4);
    expect(fractionDigits([0.00000123])).toBe(6);
    // 9.99996 rounds to 10.00, so it has two whole digits.
    expect(fractionDigits([9.99996])).toBe(2);
    expect(fractionDigits([])).toBe(0);
    expect(fractionDigits([0, NaN])).toBe(0);
  });

  it('a number alone is a group of one, without trailing zeros; blanks are blank; no "-0"', () => {
    const f = numberFormat('en-GB');
    expect(f(734.95)).toBe('735');
    expect(f(1.23456)).toBe('1.235');
    expect([f(12), f(9.6), f(400)]).toEqual(['12', '9.6', '400']);
    expect(f(NaN)).toBe('');
    expect(groupFormat([100], 'en-GB')(-0.001)).toBe('0.0');
    // In de-DE the decimal mark is a comma (source: Intl.NumberFormat, CLDR).
    expect(numberFormat('de-DE')(1.25)).toBe('1,25');
  });

  it('property: every number of a group has the same decimals, and the largest shows 4 significant digits', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e7, max: 1e7, noNaN: true }), { minLength: 1, maxLength: 20 }), (values) => {
        const f = groupFormat(values, 'en-US');
        const decimals = values.map((v) => (f(v).split('.')[1] ?? '').length);
        expect(new Set(decimals).size).toBe(1);
        const max = Math.max(...values.map(Math.abs));
        if (max >= 0.001) {
          const shown = f(values.find((v) => Math.abs(v) === max)!).replace(/[-,.]/g, '').replace(/^0+/, '');
          expect(shown.length).toBeGreaterThanOrEqual(4);
        }
      }),
    );
  });

  it('ticks get the digits of their step (0, 0.25, 0.5 → two)', () => {
    expect(tickDigits(0.25)).toBe(2);
    expect(tickDigits(0.5)).toBe(1);
    expect(tickDigits(5)).toBe(0);
    expect(tickDigits(0.0002)).toBe(4);
  });

  it('a chart labels its bars in one format: Type I values 2.29 and 2.208 show as 2.290 and 2.208', () => {
    const c = groupedBars({ title: 't', unit: 'ratio', categories: ['A', 'B'], series: [{ label: 'Type I', values: [2.29, 2.208] }], format: numberFormat('en-GB') });
    expect(c.svg).toContain('>2.290<');
    expect(c.svg).toContain('>2.208<');
    expect(c.svg).not.toMatch(/>2\.29</);
  });
});

/** The rotated title and the x title of a chart, with their positions. */
function titles(svg: string) {
  const x = /<text x="([\d.]+)" y="([\d.]+)"[^>]*class="rw-axis-title rw-x-title"[^>]*>([^<]*)<\/text>/.exec(svg);
  const y = /<text x="([\d.]+)" y="([\d.]+)"[^>]*transform="rotate\(-90 [^"]+\)"[^>]*class="rw-axis-title rw-y-title"[^>]*>([^<]*)<\/text>/.exec(svg);
  return { x: x ? { x: Number(x[1]), y: Number(x[2]), text: x[3]! } : null, y: y ? { x: Number(y[1]), y: Number(y[2]), text: y[3]! } : null };
}

describe('axis titles at the axes', () => {
  const cats = ['Food', 'Fishing', 'Hotels'];
  it('bars, stacked bars, tornado and bands: the value title with its unit under the tick values, the category title rotated at the left', () => {
    const charts = [
      groupedBars({ title: 'g', unit: 'ratio', categories: cats, series: [{ label: 'Type I', values: [1.2, 1.5, 1.1] }], valueTitle: 'Multiplier' }),
      stackedBars({ title: 's', unit: 'EUR millions', categories: cats, series: [{ key: 'direct', label: 'Direct', values: [1, 2, 3] }] }),
      tornado({ title: 'k', unit: 'jobs', base: 10, items: cats.map((l, i) => ({ label: l, low: 10 - i, high: 10 + i })) }),
      percentileBands({ title: 'b', unit: 'ratio', categories: cats, low: [1, 2, 3], mid: [1.5, 2.5, 3.5], high: [2, 3, 4] }),
    ];
    const want = ['Multiplier (ratio)', 'Impact (EUR millions)', 'Result (jobs)', 'Value (ratio)'];
    charts.forEach((c, k) => {
      const t = titles(c.svg);
      expect(t.x?.text).toBe(want[k]);
      // Below every tick value, within the chart.
      const tickYs = [...c.svg.matchAll(/<text x="[\d.]+" y="([\d.]+)" text-anchor="middle" fill="#666666" font-size="11">/g)].map((m) => Number(m[1]));
      expect(tickYs.length).toBeGreaterThan(1);
      expect(t.x!.y).toBeGreaterThan(Math.max(...tickYs));
      expect(t.x!.y).toBeLessThanOrEqual(c.height);
      // The category axis's title at the left edge.
      expect(t.y).not.toBeNull();
      expect(t.y!.x).toBeLessThan(20);
    });
  });

  it('the quadrant and the histogram name both axes with their units', () => {
    const q = linkageQuadrant({ title: 'q', codes: cats, labels: cats, backward: [1.2, 0.8, 1.1], forward: [1.3, 0.7, 0.9] });
    expect(titles(q.svg).x?.text).toMatch(/^Backward linkage .*index, average = 1\)$/);
    expect(titles(q.svg).y?.text).toMatch(/^Forward linkage .*index, average = 1\)$/);
    const h = histogram({ title: 'h', unit: 'FTE jobs', valueTitle: 'Total impact', bins: [{ x0: 0, x1: 1, count: 3 }] });
    expect(titles(h.svg).x?.text).toBe('Total impact (FTE jobs)');
    expect(titles(h.svg).y?.text).toBe('Draws (count)');
  });
});

/** The fill colours of the data marks, and those of the legend's keys. */
function colours(svg: string) {
  const legend = /<g class="rw-legend">([\s\S]*?)<\/g>/.exec(svg)?.[1] ?? '';
  const keys = new Set([...legend.matchAll(/(?:fill|stroke)="(#[0-9A-Fa-f]{6})"/g)].map((m) => m[1]!.toUpperCase()));
  const body = svg.replace(legend, '');
  const marks = new Set([...body.matchAll(/<(?:rect|circle)[^>]*fill="(#[0-9A-Fa-f]{6})"/g)].map((m) => m[1]!.toUpperCase()));
  return { keys, marks };
}

describe('every colour has a legend entry', () => {
  it('bars, stacked bars, tornado, bands, histogram and the quadrant', () => {
    const cats = ['A', 'B', 'C', 'D'];
    const charts = [
      groupedBars({ title: 'g', unit: 'ratio', categories: cats, series: [{ label: 'Type I', values: [1.2, 1.5, 1.1, 1] }, { label: 'Type II', values: [1.4, 1.7, 1.2, 1.1] }] }),
      stackedBars({ title: 's', unit: 'EUR', categories: cats, series: ['direct', 'indirect', 'induced'].map((k, i) => ({ key: k, label: k, values: [1 + i, 2, 3, -1] })) }),
      tornado({ title: 'k', unit: 'jobs', base: 10, items: cats.map((l, i) => ({ label: l, low: 10 - i, high: 10 + i })) }),
      percentileBands({ title: 'b', unit: 'ratio', categories: cats, low: [1, 2, 3, 4], mid: [1.5, 2.5, 3.5, 4.5], high: [2, 3, 4, 5], point: [1.4, 2.4, 3.4, 4.4] }),
      histogram({ title: 'h', unit: 'jobs', bins: [{ x0: 0, x1: 1, count: 3 }], markers: [{ label: 'table value', value: 0.5 }] }),
      linkageQuadrant({ title: 'q', codes: cats, labels: cats, backward: [1.2, 0.8, 1.1, 0.9], forward: [1.3, 0.7, 0.9, 1.2] }),
    ];
    for (const c of charts) {
      const { keys, marks } = colours(c.svg);
      expect(marks.size, c.title).toBeGreaterThan(0);
      for (const m of marks) expect(keys.has(m), `${c.title}: colour ${m} has a key`).toBe(true);
    }
  });
});

describe('point labels placed without overlap', () => {
  const bounds = { x: 0, y: 0, width: 400, height: 300 };
  const request = fc.record({ x: fc.integer({ min: 0, max: 400 }), y: fc.integer({ min: 0, max: 300 }), width: fc.integer({ min: 10, max: 60 }), height: fc.constant(11) });

  it('property: no two shown label boxes overlap, each stays inside the plot, and the result is deterministic', () => {
    fc.assert(
      fc.property(fc.array(request, { maxLength: 80 }), (labels) => {
        const placed = placeLabels(labels, bounds);
        const again = placeLabels(labels, bounds);
        expect(again).toEqual(placed);
        const boxes = placed.map((p) => p.box).filter((b) => b !== null);
        for (let i = 0; i < boxes.length; i++) {
          const b = boxes[i]!;
          expect(b.x >= 0 && b.y >= 0 && b.x + b.width <= 400 && b.y + b.height <= 300).toBe(true);
          for (let j = i + 1; j < boxes.length; j++) expect(overlaps(b, boxes[j]!), `labels ${i} and ${j}`).toBe(false);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('property: points far apart keep every label, next to its point', () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: 0, max: 3 * 4 - 1 }), { maxLength: 12 }), (cells) => {
        // Points on a 100-pixel lattice, away from the edges: every label fits at its first spot.
        const labels = cells.map((c) => ({ x: 50 + (c % 4) * 100, y: 50 + Math.floor(c / 4) * 100, width: 40, height: 11 }));
        const placed = placeLabels(labels, { x: 0, y: 0, width: 400, height: 300 });
        for (const [k, p] of placed.entries()) {
          expect(p.box).not.toBeNull();
          expect(p.leader).toBe(false);
          expect(Math.hypot(p.box!.x - labels[k]!.x, p.box!.y + p.box!.height - labels[k]!.y)).toBeLessThan(20);
        }
      }),
    );
  });

  it('the quadrant draws overlapping points with separate labels (the issue: linkage labels overlap)', () => {
    // Five sectors almost at the same place: the labels of the first round would sit on each other.
    const codes = ['AGRI', 'FOOD', 'HOSP', 'RETL', 'TRAN'];
    const q = linkageQuadrant({ title: 'q', codes, labels: codes, backward: [1.01, 1.011, 1.012, 1.013, 1.014], forward: [1.02, 1.021, 1.019, 1.02, 1.022], width: 640, height: 480 });
    const boxes = [...q.svg.matchAll(/<text x="([\d.]+)" y="([\d.]+)"[^>]*class="rw-point-label"[^>]*>([^<]*)<\/text>/g)].map((m) => ({ x: Number(m[1]) - 1, y: Number(m[2]) - 9, width: m[3]!.length * 6.2 + 2, height: 11, text: m[3] }));
    expect(boxes.map((b) => b.text).sort()).toEqual([...codes].sort());
    for (let i = 0; i < boxes.length; i++) for (let j = i + 1; j < boxes.length; j++) expect(overlaps(boxes[i]!, boxes[j]!), `${boxes[i]!.text} and ${boxes[j]!.text}`).toBe(false);
  });
});
