/**
 * The model's views end to end in Debian's Chromium: open the demo, visit every view, build a
 * scenario and see its results, run a short Monte Carlo and cancel a long one, edit a
 * coefficient and see the multipliers change, draw a 400-sector table on a canvas, and check
 * that no request leaves 127.0.0.1. Screenshots go to test/e2e/artifacts/.
 *
 * The numbers shown are compared with the engine run in Node on the same table, so what reaches
 * the screen is what the engine computes (the engine itself is checked against published tables
 * and ml-matrix elsewhere); the demo economy is invented and proves nothing about economics.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { buildModels, guessHousehold, makeTable, measures, multipliers, syntheticTable, toPlain } from '../../engine/index';
import { numberFormat } from '../../src/report/charts/format';
import demo from '../../data-demo/vellan-coast.table.json';
import type { PlainTable } from '../../engine/index';
import type { Browser, Served, Workbench } from './helpers';
import { openWorkbench, requireChromium, screenshot } from './helpers';

const chromium = requireChromium('the views browser test');

/** Text with its runs of white space made single spaces. */
const squash = (s: string | null) => (s ?? '').replace(/\s+/g, ' ').trim();

describe.skipIf(!chromium)('the model views in Chromium', () => {
  let wb: Workbench | undefined;
  let served: Served;
  let b: Browser;
  let page: Page;
  let work: string;

  const nav = (name: string) => page.getByRole('navigation').getByRole('button', { name, exact: true }).click();

  beforeAll(async () => {
    wb = await openWorkbench(chromium!);
    ({ served, browser: b } = wb);
    page = b.page;
    work = mkdtempSync(join(tmpdir(), 'rw-e2e-views-'));
    await page.goto(served.url);
    // The demo opens by itself on a first visit (part B); open it again from the Open step as a user would.
    await page.getByRole('navigation').getByRole('button', { name: 'Coefficients', exact: true }).waitFor({ timeout: 15_000 });
    await nav('Open');
    await page.getByRole('button', { name: 'Open the demo economy' }).click();
    await page.getByRole('navigation').getByRole('button', { name: 'Coefficients', exact: true }).waitFor();
  });

  afterAll(async () => {
    await wb?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('shows the coefficients as a heat map with values on hover and keyboard access', async () => {
    await nav('Coefficients');
    const map = page.getByRole('application');
    await map.locator('svg[role="img"]').waitFor();
    const box = (await map.boundingBox())!;
    await page.mouse.move(box.x + 200, box.y + 200);
    await expect.poll(() => map.locator('.tip').textContent()).toMatch(/→ .+\): [\d.,]+ EUR millions per EUR millions of the buyer's output/);
    await map.focus();
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('ArrowDown');
    await expect.poll(() => page.locator('#heatmap-readout').textContent()).toMatch(/^Row 2, column 2: Fishing and aquaculture \(FISH\) → Fishing and aquaculture \(FISH\)/);
    await page.keyboard.press('+');
    await expect.poll(() => page.locator('.tools .muted').textContent()).toMatch(/Zoom 1\.5×/);
    await page.keyboard.press('0');
    await screenshot(page, 'views-coefficients');
  });

  it('keeps the heat map\'s codes and colour legend in view when zoomed and panned', async () => {
    await nav('Coefficients');
    const map = page.getByRole('application');
    await map.locator('svg[role="img"]').waitFor();
    await map.scrollIntoViewIfNeeded();
    const codes = (demo as { sectors: { codes: string[] } }).sectors.codes;
    // Before zooming, the SVG's own codes serve; nothing is pinned.
    expect(await map.locator('.pin-row').count()).toBe(0);
    await map.focus();
    // From the top-left cell (the cursor may stay where an earlier test left it).
    await page.keyboard.press('Home');
    for (let k = 0; k < codes.length; k++) await page.keyboard.press('ArrowUp');
    for (let k = 0; k < 9; k++) await page.keyboard.press('ArrowDown');
    for (let k = 0; k < 11; k++) await page.keyboard.press('ArrowRight');
    for (let k = 0; k < 3; k++) await page.keyboard.press('+');
    await expect.poll(() => page.locator('.tools .muted').textContent()).toMatch(/Zoom 3\.4×/);
    await expect.poll(() => page.locator('#heatmap-readout').textContent()).toMatch(new RegExp(`^Row 10, column 12: .*\\(${codes[9]}\\) → .*\\(${codes[11]}\\)`));
    const port = (await map.boundingBox())!;
    const cursor = (await map.locator('.cursor').boundingBox())!;
    // The cursor cell's row and column codes are pinned at the edges, level with the cell.
    const row = map.locator('.pin-row', { hasText: new RegExp(`^${codes[9]}$`) });
    const col = map.locator('.pin-col', { hasText: new RegExp(`^${codes[11]}$`) });
    await row.waitFor();
    await col.waitFor();
    const rb = (await row.boundingBox())!;
    const cb = (await col.boundingBox())!;
    expect(Math.abs(rb.y + rb.height / 2 - (cursor.y + cursor.height / 2))).toBeLessThan(cursor.height / 2);
    expect(Math.abs(cb.x + cb.width / 2 - (cursor.x + cursor.width / 2))).toBeLessThan(cursor.width / 2);
    expect(rb.x).toBeGreaterThanOrEqual(port.x - 1);
    expect(rb.x + rb.width).toBeLessThan(port.x + 80);
    expect(cb.y).toBeGreaterThanOrEqual(port.y - 1);
    expect(cb.y + cb.height).toBeLessThan(port.y + 70);
    // Only codes of rows in view are pinned, each inside the view.
    const shown = await map.locator('.pin-row').allTextContents();
    expect(shown.length).toBeGreaterThan(0);
    expect(shown.length).toBeLessThan(codes.length);
    for (const t of shown) expect(codes).toContain(t);
    // The colour legend stays outside the zoomed picture, unscaled, with its scale and note.
    const legend = page.locator('.heat-legend svg.rw-heat-legend');
    await expect.poll(() => legend.count()).toBe(1);
    expect(await map.locator('.rw-heat-legend').count()).toBe(0);
    const lb = (await legend.boundingBox())!;
    expect(lb.y).toBeGreaterThanOrEqual(port.y + port.height - 1);
    expect(await legend.textContent()).toMatch(/square-root colour scale; empty cells are zero/);
    // Dragging pans; the pinned codes follow the cells in view.
    await page.mouse.move(port.x + port.width / 2, port.y + port.height / 2);
    await page.mouse.down();
    await page.mouse.move(port.x + port.width / 2 + 120, port.y + port.height / 2 + 120, { steps: 4 });
    await page.mouse.up();
    await expect.poll(async () => (await map.locator('.pin-row').allTextContents()).join(' ')).not.toBe(shown.join(' '));
    await screenshot(page, 'views-coefficients-zoomed');
    await page.keyboard.press('0');
    await expect.poll(() => map.locator('.pin-row').count()).toBe(0);
  });

  it('shows multipliers for every measure with Type I and Type II, sortable, as the engine computes them', async () => {
    await nav('Multipliers');
    const table = page.locator('#mult-table');
    await table.locator('tbody tr').first().waitFor();
    // The engine in Node on the same table, with the same guessed closure.
    const t = makeTable(demo as unknown as PlainTable);
    const m = multipliers(buildModels(t, { household: guessHousehold(t)! }), measures(t));
    const food = t.sectors.codes.indexOf('FOOD');
    const f3 = new Intl.NumberFormat(undefined, { minimumFractionDigits: 3, maximumFractionDigits: 3 });
    const row = table.locator('tbody tr', { hasText: 'Food and seafood processing' });
    await expect.poll(() => row.textContent()).toContain(f3.format(m[0]!.simple[food]!));
    await expect.poll(() => row.textContent()).toContain(f3.format(m[0]!.total![food]!));
    await page.getByLabel('Type I and Type II').check();
    await expect.poll(() => row.textContent()).toContain(f3.format(m[0]!.typeII![food]!));
    // Sort by Type I, smallest first: the header says so to screen readers.
    await table.getByRole('button', { name: /^Type I\b(?!I)/ }).click();
    await table.getByRole('button', { name: /^Type I\b(?!I)/ }).click();
    await expect.poll(() => table.locator('th[aria-sort="ascending"]').textContent()).toMatch(/Type I/);
    await page.getByLabel('Measure').first().selectOption('JOBS');
    await expect.poll(() => page.locator('.unit').first().textContent()).toMatch(/FTE jobs per EUR millions of final demand/);
    expect(await page.locator('figure.chart svg[role="img"] title').first().textContent()).toMatch(/Employment multipliers by sector/);
    await screenshot(page, 'views-multipliers');
    await page.getByLabel('Measure').first().selectOption('output');
    await page.getByLabel('Simple and total').check();
  });

  it('shows the linkage quadrant with the key-sector groups named', async () => {
    await nav('Linkages');
    await page.locator('#link-table tbody tr').first().waitFor();
    await expect.poll(() => page.getByRole('heading', { name: /^Key sectors \(\d+\)$/ }).count()).toBe(1);
    expect(await page.locator('figure.chart svg[role="img"] desc').textContent()).toMatch(/Scatter of backward against forward linkage for 16 sectors/);
    await screenshot(page, 'views-linkages');
  });

  it('builds scenarios with inline checks, and shows their results compared against a base', async () => {
    await nav('Scenarios');
    await page.getByRole('button', { name: 'Load the demo scenarios' }).click();
    await expect.poll(() => page.locator('.pick small', { hasText: 'ready' }).count()).toBe(3);
    await page.getByRole('button', { name: 'Add a scenario' }).click();
    const search = page.getByLabel('Add a demand change: find a sector by code or name');
    await search.fill('accommodation');
    await page.getByRole('button', { name: 'Add Accommodation and food services (HOSP)' }).click();
    await page.getByLabel('Change 1: amount in EUR millions').fill('12');
    await page.getByLabel('Change 1: local share in percent (empty means 100)').fill('150');
    await expect.poll(() => page.locator('.problems').first().textContent()).toMatch(/local share 1\.5 must be a number from 0 to 1/);
    await page.getByLabel('Change 1: local share in percent (empty means 100)').fill('80');
    await expect.poll(async () => squash(await page.locator('p.ok').textContent())).toMatch(/a change in final demand of 12 EUR millions, of which 9\.6 EUR millions reaches local producers/);
    await page.getByLabel('Name', { exact: true }).fill('Hotel expansion');
    await page.getByLabel('Name', { exact: true }).press('Enter');
    await expect.poll(() => page.locator('#scen-edit-h').textContent()).toBe('Hotel expansion');
    await page.getByRole('button', { name: 'Duplicate' }).click();
    await expect.poll(() => page.locator('#scen-edit-h').textContent()).toBe('Hotel expansion (copy)');
    await page.getByRole('button', { name: 'Delete…' }).click();
    await page.getByRole('button', { name: 'Yes, delete' }).click();
    await expect.poll(() => page.locator('.pick').count()).toBe(4);
    await screenshot(page, 'views-scenarios');

    await nav('Results');
    const totals = page.locator('#res-totals');
    await totals.locator('tbody tr').first().waitFor();
    await expect.poll(() => page.locator('#res-compare thead').textContent()).toMatch(/Hotel expansion/);
    expect(await page.locator('#res-compare thead').textContent()).toMatch(/Coastal health centre − New seafood processing plant/);
    await page.getByLabel('Base for differences').selectOption({ label: 'Hotel expansion' });
    await expect.poll(() => page.locator('#res-compare thead').textContent()).toMatch(/New seafood processing plant − Hotel expansion/);
    await page.getByLabel('Scenario shown').selectOption({ label: 'Hotel expansion' });
    await expect.poll(() => page.locator('#res-h ~ h3').first().textContent()).toBe("'Hotel expansion'");
    // The direct output effect is the local demand change itself: 12 × 0.8.
    await expect.poll(() => totals.locator('tbody tr', { hasText: 'Output' }).locator('td').nth(1).textContent()).toBe(numberFormat()(9.6));
    expect(await page.locator('figure.chart svg title').first().textContent()).toMatch(/Output impact of 'Hotel expansion' by sector/);
    expect(await page.getByRole('complementary', { name: 'Cautions' }).first().textContent()).toMatch(/not a forecast/);
    await screenshot(page, 'views-results');
    await page.getByLabel('Theme').selectOption('dark');
    await screenshot(page, 'views-results-dark');
    await page.getByLabel('Theme').selectOption('light');
  });

  it('shows the tornado, runs a short Monte Carlo, cancels a long one, and updates multipliers on a what-if edit', async () => {
    await nav('Sensitivity');
    await page.locator('#sens-influential tbody tr').first().waitFor();
    expect(await page.locator('figure.chart svg title').first().textContent()).toMatch(/^Tornado: Output multiplier of Agriculture and horticulture/);

    await page.getByLabel('Draws', { exact: true }).fill('400');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await expect.poll(() => page.getByText(/of 400 draws accepted/).count(), { timeout: 20_000 }).toBe(1);
    expect(await page.locator('figure.chart svg title', { hasText: '5th to 95th percentile' }).count()).toBe(1);

    // Shared among two Web Workers and run in the engine worker alone, the same seed gives the
    // same percentiles, digit for digit (every draw depends only on the seed and its index).
    const mcCells = () => page.locator('#mc-table tbody td').allTextContents();
    await page.getByRole('combobox', { name: /^Workers/ }).selectOption('2');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await expect.poll(() => page.getByText(/of 400 draws accepted \(seed 1; shared among 2 workers\)/).count(), { timeout: 20_000 }).toBe(1);
    const shared = await mcCells();
    await page.getByRole('combobox', { name: /^Workers/ }).selectOption('1');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await expect.poll(() => page.getByText(/of 400 draws accepted \(seed 1; run in the engine worker\)/).count(), { timeout: 20_000 }).toBe(1);
    const alone = await mcCells();
    expect(shared.length).toBeGreaterThan(10);
    expect(shared).toEqual(alone);
    await page.getByRole('combobox', { name: /^Workers/ }).selectOption('auto');

    // A long run: progress moves, the page answers, and Cancel stops it.
    await page.getByLabel('Draws', { exact: true }).fill('50000');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    const progress = page.getByLabel('Monte Carlo progress');
    await progress.waitFor();
    await expect.poll(async () => Number(await progress.getAttribute('value')), { timeout: 20_000 }).toBeGreaterThan(0);
    await page.getByRole('button', { name: 'Cancel Monte Carlo' }).click();
    await expect.poll(() => page.locator('main > .error[role="alert"]').textContent()).toBe('Cancelled.');
    await expect.poll(() => progress.count()).toBe(0);
    expect(await page.getByText(/of 50,?000 draws accepted/).count()).toBe(0);
    await expect.poll(() => page.getByText('The settings changed since this run').count()).toBe(1);

    // What-if: FOOD buying more from FISH raises FOOD's output multiplier at once.
    await page.getByLabel('Supplier (row)').selectOption('FISH');
    await page.getByLabel('Buyer (column)').selectOption('FOOD');
    await page.getByLabel('New value', { exact: true }).fill('0.3');
    const row = page.locator('#whatif-table tbody tr', { hasText: 'Food and seafood processing' });
    await expect.poll(() => row.getAttribute('class')).toMatch(/marked/);
    const cells = await row.locator('td').allTextContents();
    const parse = (s: string) => Number(s.replace(/[^\d.-]/g, ''));
    expect(parse(cells[1]!)).toBeGreaterThan(parse(cells[0]!));
    expect(await page.locator('.edits tbody tr').count()).toBe(1);
    await screenshot(page, 'views-sensitivity');
    await page.getByRole('button', { name: 'Undo every edit' }).click();
    await expect.poll(() => page.locator('#whatif-table tr.marked').count()).toBe(0);
  });

  it('draws a 400-sector table on a canvas', async () => {
    const big = join(work, 'synthetic-400.json');
    writeFileSync(big, JSON.stringify(toPlain(syntheticTable({ regions: 4, sectors: 100, seed: 3 }))));
    await nav('Open');
    await page.locator('input[type=file]').setInputFiles(big);
    await expect.poll(() => page.locator('header').textContent(), { timeout: 20_000 }).toMatch(/synthetic-400\.json/);
    await nav('Coefficients');
    await page.getByRole('application').locator('canvas').waitFor({ timeout: 20_000 });
    expect(await page.getByRole('application').locator('svg').count()).toBe(0);
    expect(await page.getByText('400 × 400 coefficients, drawn on a canvas.').count()).toBe(1);
    // The map may start below the fold (a banner or the header's second line above it): bring it into view first.
    await page.getByRole('application').scrollIntoViewIfNeeded();
    const box = (await page.getByRole('application').boundingBox())!;
    await page.mouse.move(box.x + Math.min(300, box.width / 2), box.y + Math.min(300, box.height / 2));
    await page.mouse.wheel(0, -500);
    await expect.poll(() => page.locator('.tools .muted').textContent()).not.toMatch(/Zoom 1\.0×/);
    await screenshot(page, 'views-coefficients-400');
  });

  it('sent no request beyond 127.0.0.1 and raised no page error', () => {
    expect(b.outside).toEqual([]);
    expect(b.errors).toEqual([]);
  });
});
