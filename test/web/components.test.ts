/**
 * Markup of the views' components, rendered to HTML in Node (svelte/server): real buttons and
 * labels, sorting state for screen readers, undefined numbers shown blank, the heat map as SVG
 * for small tables and on a canvas above 200 sectors, charts with role=img, a title and a
 * description, labels from a file escaped. And the shared charts added for the views.
 */
import { describe, expect, it } from 'vitest';
import { render } from 'svelte/server';
import SortableTable from '../../web/components/SortableTable.svelte';
import HeatMap from '../../web/components/HeatMap.svelte';
import { cellAt, clampView, zoomAt } from '../../web/lib/zoom';
import Cautions from '../../web/components/Cautions.svelte';
import { heatColour, heatMap, heatRgb, percentileBands } from '../../src/report/charts';
import { fmt } from '../../web/lib/numbers';

const hostile = '<img src=x onerror=alert(1)>';

describe('components', () => {
  it('a sortable table has header buttons, aria-sort on the sorted column, blanks for NaN and sorts blanks last', () => {
    const { body } = render(SortableTable, {
      props: {
        caption: 'Multipliers',
        columns: [
          { key: 'label', label: 'Sector' },
          { key: 'typeI', label: 'Type I', numeric: true },
        ],
        rows: [
          { code: 'A', label: 'Alpha', typeI: Number.NaN },
          { code: 'B', label: hostile, typeI: 1.5 },
          { code: 'C', label: 'Gamma', typeI: 2.25 },
        ],
        sort: 'typeI',
        descending: true,
      },
    });
    expect(body).toMatch(/<caption[^>]*>Multipliers<\/caption>/);
    expect(body).toMatch(/<th scope="col" aria-sort="descending" class="[^"]*num">/);
    expect(body).toMatch(/aria-sort="none"/);
    expect((body.match(/<button type="button" class="sort[ "]/g) ?? []).length).toBe(2);
    expect(body).not.toContain('NaN');
    expect(body).not.toContain('<img');
    expect(body).toContain('&lt;img');
    const order = ['Gamma', '&lt;img', 'Alpha'].map((s) => body.indexOf(s));
    expect(order[0]).toBeLessThan(order[1]!);
    expect(order[1]).toBeLessThan(order[2]!);
    // One rule for the column (largest 2.25: four significant digits), the same decimals on every row.
    expect(body).toContain('>' + fmt(2.25, 3) + '<');
    expect(body).toContain('>' + fmt(1.5, 3) + '<');
  });

  it('the heat map is the shared SVG up to 200 sectors and a canvas above, with zoom buttons and a labelled keyboard region', () => {
    const small = render(HeatMap, { props: { title: 'A', unit: 'per unit', n: 3, values: Float64Array.of(0, 0.2, 0, 0.1, 0, 0.3, 0.05, 0, 0), codes: ['X', 'Y', 'Z'], labels: ['Ex', 'Why', 'Zed'] } }).body;
    expect(small).toMatch(/<svg[^>]*role="img"/);
    expect(small).not.toContain('<canvas');
    expect(small).toContain('aria-label="Zoom in"');
    expect(small).toContain('role="application"');
    expect(small).toMatch(/aria-label="A\. 3 by 3 cells in per unit/);
    const n = 201;
    const big = render(HeatMap, { props: { title: 'B', unit: 'u', n, values: new Float64Array(n * n).fill(0.01), codes: Array.from({ length: n }, (_, i) => `S${i}`), labels: Array.from({ length: n }, (_, i) => `Sector ${i}`) } }).body;
    expect(big).toContain('<canvas');
    expect(big.slice(big.indexOf('class="port'), big.indexOf('class="heat-legend'))).not.toContain('<svg');
    // The colour legend is an SVG of its own outside the zoomed view, so zooming never hides it.
    expect(big).toMatch(/<div class="heat-legend[^"]*"><!--[^>]*--><svg[^>]*class="rw-chart rw-heat-legend"/);
  });

  it('zoom keeps the point under the pointer still; pan is clamped; the pointer finds its cell', () => {
    const v = zoomAt({ s: 1, tx: 0, ty: 0 }, 2, 100, 50);
    expect(v).toEqual({ s: 2, tx: -100, ty: -50 });
    // The content point under (100, 50) is the same before and after.
    expect((100 - v.tx) / v.s).toBe(100);
    expect(zoomAt(v, 1000, 0, 0, 1, 8).s).toBe(8);
    expect(clampView({ s: 2, tx: 50, ty: -5000 }, 400, 300, 400, 300)).toEqual({ s: 2, tx: 0, ty: -300 });
    const grid = { x: 10, y: 20, cell: 5, rows: 4, cols: 4 };
    expect(cellAt({ s: 1, tx: 0, ty: 0 }, grid, 10, 20)).toEqual({ i: 0, j: 0 });
    // (31 + 20) / 2 = 25.5 in content pixels: (25.5 − 10) / 5 = 3.1, column 3.
    expect(cellAt({ s: 2, tx: -20, ty: -40 }, grid, 31, 9)).toEqual({ i: 0, j: 3 });
    expect(cellAt({ s: 1, tx: 0, ty: 0 }, grid, 9, 20)).toBeNull();
  });

  it('the cautions show the usual ones and the analysis’s own', () => {
    const { body } = render(Cautions, { props: { items: ['Each coefficient is changed alone.'] } });
    expect(body).toContain('aria-label="Cautions"');
    expect(body).toMatch(/fixed coefficients/);
    expect(body).toContain('<li>Each coefficient is changed alone.</li>');
  });
});

describe('charts added for the views', () => {
  it('heat map: one square per nonzero cell, zero cells empty, labels escaped, no inline style, a title and description', () => {
    const c = heatMap({ title: 'Coefficients <A>', unit: 'per unit', rows: 2, cols: 2, values: [0.5, 0, -0.1, 0.25], rowCodes: [hostile, 'B'], colCodes: ['C', 'D'] });
    expect(c.svg).not.toContain('<img');
    expect(c.svg).toContain('&lt;img');
    expect(c.svg).not.toMatch(/<[a-z]+[^>]*\sstyle=/i);
    expect(c.svg).toMatch(/<title id="[^"]+-t">Coefficients &lt;A&gt;<\/title>/);
    expect(c.svg).toMatch(/1 cell is zero, 1 negative/);
    const cells = c.svg.slice(c.svg.indexOf('class="rw-cells"'), c.svg.indexOf('</g>'));
    expect((cells.match(/<rect/g) ?? []).length).toBe(3);
    expect(c.max).toBe(0.5);
    expect(c.grid).toEqual({ x: c.grid.x, y: c.grid.y, cell: 28, rows: 2, cols: 2 });
    expect(() => heatMap({ title: 't', unit: 'u', rows: 2, cols: 2, values: [1, 2, 3], rowCodes: ['a', 'b'], colCodes: ['a', 'b'] })).toThrow(/needs 4 values; it was given 3/);
  });

  it('heat colours: empty for zero, darker for larger values, a second hue below zero, the same as bytes', () => {
    expect(heatColour(0, 1)).toBe('');
    expect(heatRgb(0, 1)).toBeNull();
    const lum = (v: number) => {
      const [r, g, b] = heatRgb(v, 1)!;
      return 0.2126 * r + 0.7152 * g + 0.0722 * b;
    };
    expect(lum(0.01)).toBeGreaterThan(lum(0.2));
    expect(lum(0.2)).toBeGreaterThan(lum(1));
    expect(heatColour(-0.5, 1)).not.toBe(heatColour(0.5, 1));
  });

  it('percentile bands: sorted by the median, each band from low to high with its point, blanks skipped', () => {
    const c = percentileBands({ title: 'Bands', unit: 'ratio', categories: ['Low', 'High', hostile, 'Gone'], low: [1, 2, 1.5, NaN], mid: [1.1, 2.2, 1.6, NaN], high: [1.2, 2.4, 1.7, NaN], point: [1.1, 2.1, 1.6, 1] });
    expect(c.svg).toMatch(/role="img"/);
    expect(c.svg).not.toContain('<img');
    expect(c.svg.indexOf('>High<')).toBeLessThan(c.svg.indexOf('&lt;img'));
    expect(c.svg.indexOf('&lt;img')).toBeLessThan(c.svg.indexOf('>Low<'));
    expect(c.svg).not.toContain('>Gone<');
    expect((c.svg.match(/<circle/g) ?? []).length).toBe(4); // three points and the legend's
  });
});
