/**
 * The shared charts: every label escaped (no markup from a file survives), no inline style (a
 * strict Content-Security-Policy forbids it), the data drawn in the right order and sign.
 */
import { describe, expect, it } from 'vitest';
import { groupedBars, histogram, linkageQuadrant, stackedBars, tornado, escapeXml } from '../../src/report/charts';

const hostile = ['<script>alert(1)</script>', '"><img src=x onerror=alert(1)>', "=HYPERLINK('x')", '&amp; Co', 'Plain'];

function noMarkupFromLabels(svg: string) {
  expect(svg).not.toMatch(/<script/i);
  expect(svg).not.toMatch(/<img/i);
  // No tag carries an inline style or an event handler (text content may mention them, escaped).
  expect(svg).not.toMatch(/<[a-z]+[^>]*\sstyle=/i);
  expect(svg).not.toMatch(/<[a-z]+[^>]*\son\w+=/i);
}

describe('charts', () => {
  it('escape text for XML (common practice: the five XML special characters)', () => {
    expect(escapeXml(`<a href="x">'&'</a>`)).toBe('&lt;a href=&quot;x&quot;&gt;&#39;&amp;&#39;&lt;/a&gt;');
  });

  it('stacked bars sort by total, stack negatives to the left and escape labels', () => {
    const c = stackedBars({
      title: 'Impact <by> sector',
      unit: 'EUR millions',
      categories: hostile,
      series: [
        { key: 'direct', label: 'Direct', values: [1, -5, 3, 0, 0.5] },
        { key: 'indirect', label: 'Indirect', values: [1, -1, 1, 0, 0.2] },
      ],
    });
    noMarkupFromLabels(c.svg);
    expect(c.svg).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(c.svg).toContain('Impact &lt;by&gt; sector');
    // The largest absolute total (−6, the second label) comes first.
    const first = c.svg.indexOf('&quot;&gt;&lt;img');
    const second = c.svg.indexOf('=HYPERLINK');
    expect(first).toBeGreaterThan(0);
    expect(first).toBeLessThan(second);
    expect(c.svg.startsWith('<svg')).toBe(true);
    expect(c.svg).toContain('role="img"');
  });

  it('grouped bars, the quadrant, the tornado and the histogram escape labels and carry titles', () => {
    const charts = [
      groupedBars({ title: 't', unit: 'ratio', categories: hostile, series: [{ label: 'Type I', values: [1.2, 1.5, 1.1, 1.3, 1] }], reference: 1 }),
      linkageQuadrant({ title: 'q', codes: hostile, labels: hostile, backward: [1.2, 0.8, 1.1, 0.9, 1], forward: [1.3, 0.7, 0.9, 1.2, 1] }),
      tornado({ title: 'k', unit: 'jobs', base: 100, items: hostile.map((l, i) => ({ label: l, low: 100 - i, high: 100 + 2 * i })) }),
      histogram({ title: 'h', unit: 'jobs', bins: [{ x0: 0, x1: 1, count: 3 }, { x0: 1, x1: 2, count: 5 }], markers: [{ label: '<p50>', value: 1.2 }] }),
    ];
    for (const c of charts) {
      noMarkupFromLabels(c.svg);
      expect(c.svg).toMatch(/<title id="[^"]+-t">/);
    }
    expect(charts[1]!.svg).toContain('Key sectors');
    expect(charts[3]!.svg).toContain('&lt;p50&gt;');
    // The histogram's y axis has its title along the axis (rotated), as the x axis has its unit.
    expect(charts[3]!.svg).toMatch(/<text[^>]*transform="rotate\(-90 12 [\d.]+\)"[^>]*>Draws \(count\)<\/text>/);
  });
});
