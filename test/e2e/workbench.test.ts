/**
 * The workbench's whole job end to end in Debian's Chromium: the demo on first visit; a CSV
 * table through the layout step to its findings, a click on a finding showing its cell; an XLSX
 * workbook; scenarios and their results; the report exported and its downloaded files read
 * back; the autosave found after a reload; a project saved and opened again; a malformed file
 * refused with its message while the work stays; starting fresh; a long file of two years read
 * for one year through "Keep only lines where"; keyboard use; and no request beyond 127.0.0.1. Screenshots go to test/e2e/artifacts/.
 *
 * What the page shows is compared with src/io and the engine run in Node on the same files, and
 * the report's multipliers with ml-matrix 6.15.1 (an independent general-purpose library:
 * column sums of (I − A)⁻¹). The demo economy and the two-year long file are invented and prove
 * nothing about economics.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Download, Page } from 'playwright-core';
import { inverse as mlInverse, Matrix as MlMatrix } from 'ml-matrix';
import { checks } from '../../engine/index';
import { readTableFile, writeWorkbook } from '../../src/io/index';
import type { Browser, Served, Workbench } from './helpers';
import { openWorkbench, REPO, requireChromium, screenshot } from './helpers';
import { BEA_DIR, BEA_SOURCE, beaAvailable, readTriplets } from '../helpers/reference';

const chromium = requireChromium('the workbench browser test');

describe.skipIf(!chromium)('the workbench in Chromium: files, projects and export', () => {
  let wb: Workbench | undefined;
  let served: Served;
  let b: Browser;
  let page: Page;
  let work: string;
  let csvPath: string;
  let csvBytes: Uint8Array;
  const xlsxPath = join(REPO, 'data-demo/vellan-coast.xlsx');

  const nav = (name: string) => page.getByRole('navigation').getByRole('button', { name, exact: true }).click();
  const header = () => page.locator('header .table-name').textContent();
  const saved = () => expect.poll(() => page.locator('header .autosave').textContent(), { timeout: 10_000 }).toBe('Saved in this browser');
  const fileInput = () => page.locator('main input[type=file]').first();

  async function downloaded(click: () => Promise<void>): Promise<{ d: Download; text: string; bytes: Buffer }> {
    const wait = page.waitForEvent('download', { timeout: 30_000 });
    await click();
    const d = await wait;
    const path = join(work, d.suggestedFilename());
    await d.saveAs(path);
    const bytes = readFileSync(path);
    return { d, text: bytes.toString('utf8'), bytes };
  }

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'rw-e2e-bench-'));
    // The demo CSV with one flow raised by 40, so that FISH no longer balances (a finding with a cell).
    const lines = readFileSync(join(REPO, 'data-demo/vellan-coast.csv'), 'utf8').split('\n');
    const at = lines.findIndex((l) => l.startsWith('FISH,'));
    const c = lines[at]!.split(',');
    c[5] = String(Number(c[5]) + 40);
    lines[at] = c.join(',');
    csvPath = join(work, 'coast-edited.csv');
    writeFileSync(csvPath, lines.join('\n'));
    csvBytes = new Uint8Array(readFileSync(csvPath));
    wb = await openWorkbench(chromium!);
    ({ served, browser: b } = wb);
    page = b.page;
  });

  afterAll(async () => {
    await wb?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('opens the demo economy on the first visit, with its checks, and a skip link first in the tab order', async () => {
    await page.goto(served.url);
    await expect.poll(header, { timeout: 15_000 }).toBe('Vellan Coast (invented demo)');
    await page.locator('#checks-h').waitFor();
    expect(await page.locator('.findings li').count()).toBeGreaterThan(0);
    await page.keyboard.press('Tab');
    expect(await page.evaluate(() => document.activeElement?.textContent)).toBe('Skip to the content');
    await page.keyboard.press('Enter');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('main');
    await screenshot(page, 'workbench-demo-checks');
  });

  it('opens a CSV table, shows the detected layout, reads it and lists the findings src/io and the engine give; a click shows the cell', async () => {
    await nav('Open');
    await fileInput().setInputFiles(csvPath);
    await page.locator('#layout-h').waitFor();
    // The preview highlights the blocks found.
    await expect.poll(() => page.locator('.preview td.r-intermediate').count()).toBeGreaterThan(50);
    expect(await page.locator('.preview td.r-title').count()).toBeGreaterThan(0);
    expect(await page.locator('.preview td.r-code').count()).toBeGreaterThan(10);
    expect(await page.locator('.legend').textContent()).toMatch(/title rows.*codes.*labels.*intermediate square/);
    // Page right: final demand and total output come into view (a big sheet is shown a page at a time).
    await page.getByRole('button', { name: 'Columns right' }).click();
    await expect.poll(() => page.locator('.preview td.r-final-demand').count()).toBeGreaterThan(10);
    expect(await page.locator('.preview td.r-total').count()).toBeGreaterThan(10);
    expect(await page.locator('pre.json').textContent()).toMatch(/"format": "ripplewise-layout"/);
    await screenshot(page, 'workbench-layout');
    await page.getByRole('button', { name: 'Read the table' }).click();
    await page.locator('#checks-h').waitFor();
    await expect.poll(header).toBe('coast-edited.csv');
    // The same file through src/io and the engine in Node.
    const r = await readTableFile(csvBytes, { file: 'coast-edited.csv' });
    const expected = [...r.findings, ...checks(r.table)];
    const shown = await page.locator('.findings li').allTextContents();
    expect(shown.length).toBe(expected.length);
    for (const f of expected) expect(shown.some((s) => s.includes(f.message)), f.message).toBe(true);
    // The total-output mismatch points at a cell: the click shows it in the grid.
    await page.locator('.findings li', { hasText: 'total-mismatch' }).getByRole('button').click();
    const cell = expected.find((f) => f.code === 'total-mismatch')!.where!.cell!;
    await expect.poll(() => page.locator('.cell h3').textContent()).toBe(`file coast-edited.csv, cell ${cell}`);
    await expect.poll(() => page.locator('.preview td[aria-current="true"]').getAttribute('data-cell')).toBe(cell);
    // A check of the engine (row balance) is mapped to the same cell through the layout.
    await page.locator('.findings li', { hasText: 'row-imbalance' }).getByRole('button').click();
    await expect.poll(() => page.locator('.cell h3').textContent()).toBe(`file coast-edited.csv, cell ${cell}`);
    await screenshot(page, 'workbench-checks-cell');
  });

  it('opens an XLSX workbook, lists its sheets and reads the table', async () => {
    await nav('Open');
    await fileInput().setInputFiles(xlsxPath);
    await page.locator('#layout-h').waitFor();
    await expect.poll(() => page.getByRole('combobox', { name: /^Sheet\b/ }).locator('option').count()).toBeGreaterThan(0);
    await page.getByRole('button', { name: 'Read the table' }).click();
    await page.locator('#checks-h').waitFor();
    await expect.poll(header).toMatch(/^vellan-coast\.xlsx/);
    const r = await readTableFile(new Uint8Array(readFileSync(xlsxPath)), { file: 'vellan-coast.xlsx' });
    await expect.poll(() => page.locator('.findings li').count()).toBe(r.findings.length + checks(r.table).length);
  });

  it('builds scenarios and shows their results', async () => {
    await nav('Scenarios');
    await page.getByRole('button', { name: 'Load the demo scenarios' }).click();
    await expect.poll(() => page.locator('.pick small', { hasText: 'ready' }).count()).toBe(3);
    await nav('Results');
    await page.locator('#res-totals tbody tr').first().waitFor();
    expect(await page.getByRole('complementary', { name: 'Cautions' }).first().textContent()).toMatch(/not a forecast/);
    await screenshot(page, 'workbench-results');
  });

  it('exports the report: HTML with the cautions and the numbers, JSON as ml-matrix gives the multipliers, XLSX a workbook', async () => {
    await nav('Report');
    await screenshot(page, 'workbench-report');
    const html = await downloaded(() => page.getByRole('button', { name: 'Download HTML' }).click());
    expect(html.d.suggestedFilename()).toMatch(/\.html$/);
    expect(html.text).toMatch(/not a forecast/i);
    expect(html.text).toMatch(/qualified economist/i);
    expect(html.text).toContain('INVENTED DATA');
    expect(html.text).toContain('New seafood processing plant');
    const json = await downloaded(() => page.getByRole('button', { name: 'Download JSON' }).click());
    const rep = JSON.parse(json.text);
    expect(rep.format).toBe('ripplewise-report');
    expect(rep.inputs[0].name).toBe('vellan-coast.xlsx');
    expect(rep.inputs[0].sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(rep.cautions.join(' ')).toMatch(/not a forecast/i);
    const r = await readTableFile(new Uint8Array(readFileSync(xlsxPath)), { file: 'vellan-coast.xlsx' });
    const t = r.table;
    const n = t.x.length;
    const M = new MlMatrix(n, n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) M.set(i, j, (i === j ? 1 : 0) - t.Z.data[i * n + j]! / t.x[j]!);
    const L = mlInverse(M);
    const mt = rep.sections.find((s: { kind: string }) => s.kind === 'multipliers').tables[0];
    const col = mt.columns.findIndex((c: { key: string }) => /simple/i.test(c.key));
    for (const code of ['FOOD', 'FISH', 'HOSP']) {
      const j = t.sectors.codes.indexOf(code);
      let sum = 0;
      for (let i = 0; i < n; i++) sum += L.get(i, j);
      const row = mt.rows.find((x: unknown[]) => x[0] === code);
      expect(Math.abs(row[col] - sum)).toBeLessThan(1e-9);
      // The same number, in the page's locale, is in the HTML report.
      expect(html.text).toContain(new Intl.NumberFormat('en-US', { minimumFractionDigits: 3, maximumFractionDigits: 3 }).format(sum));
    }
    expect(rep.sections.filter((s: { kind: string }) => s.kind === 'scenario')).toHaveLength(3);
    const x = await downloaded(() => page.getByRole('button', { name: 'Download XLSX' }).click());
    expect([x.bytes[0], x.bytes[1]]).toEqual([0x50, 0x4b]);
  });

  it('finds the autosaved work after a reload', async () => {
    await saved();
    await page.reload();
    await expect.poll(header, { timeout: 15_000 }).toMatch(/^vellan-coast\.xlsx/);
    await nav('Scenarios');
    await expect.poll(() => page.locator('.pick').count()).toBe(3);
  });

  it('refuses a malformed file with a message naming file, row, column and text, and keeps the work', async () => {
    const text = readFileSync(csvPath, 'utf8').split('\n');
    const at = text.findIndex((l) => l.startsWith('FOOD,'));
    const c = text[at]!.split(',');
    c[6] = 'n/a';
    text[at] = c.join(',');
    const bad = join(work, 'broken.csv');
    writeFileSync(bad, text.join('\n'));
    await nav('Open');
    await fileInput().setInputFiles(bad);
    await page.locator('#layout-h').waitFor();
    await page.getByRole('button', { name: 'Read the table' }).click();
    const alert = page.locator('main > .error[role="alert"]');
    await expect.poll(() => alert.textContent()).toMatch(/broken\.csv/);
    const msg = (await alert.textContent())!;
    expect(msg).toMatch(/'n\/a'/);
    expect(msg).toMatch(new RegExp(`row ${at + 1}`));
    expect(msg).toMatch(/column 7/);
    expect(msg).toMatch(new RegExp(`cell G${at + 1}`));
    await screenshot(page, 'workbench-malformed');
    // The file waits at the Layout step; the table open is still the workbook's.
    expect(await header()).toMatch(/^Reading broken\.csv: layout not confirmed \(open now: vellan-coast\.xlsx/);
    await nav('Scenarios');
    await expect.poll(() => page.locator('.pick').count()).toBe(3);
  });

  it('saves a project, starts fresh (with a confirmation), and opens the project again', async () => {
    const proj = await downloaded(() => page.getByRole('button', { name: 'Save project' }).click());
    const doc = JSON.parse(proj.text);
    expect(doc.format).toBe('ripplewise-project');
    expect(doc.scenarios).toHaveLength(3);
    expect(doc.source.name).toBe('vellan-coast.xlsx');
    expect(doc.source.mapping.format).toBe('ripplewise-layout');
    await page.getByRole('button', { name: 'Start fresh…' }).click();
    // The safe choice has the focus, and Escape keeps the work.
    await expect.poll(() => page.evaluate(() => document.activeElement?.textContent)).toBe('Keep my work');
    await page.keyboard.press('Escape');
    expect(await page.getByRole('alertdialog').count()).toBe(0);
    expect(await header()).toMatch(/^vellan-coast\.xlsx/);
    await page.getByRole('button', { name: 'Start fresh…' }).click();
    await page.getByRole('button', { name: 'Yes, start fresh' }).click();
    await expect.poll(header).toBe('');
    expect(await page.getByRole('navigation').getByRole('button', { name: 'Coefficients' }).count()).toBe(0);
    await saved();
    await page.reload();
    await page.locator('#open-h').waitFor({ timeout: 15_000 });
    expect(await header()).toBe('');
    const path = join(work, proj.d.suggestedFilename());
    await fileInput().setInputFiles(path);
    await expect.poll(header, { timeout: 15_000 }).toMatch(/^vellan-coast\.xlsx/);
    await nav('Scenarios');
    await expect.poll(() => page.locator('.pick').count()).toBe(3);
  });

  it.skipIf(!beaAvailable())(`reads make and use tables given as two files into an industry-by-industry table whose output multipliers are the column sums of Table 8 (source: ${BEA_SOURCE})`, async () => {
    await nav('Open');
    await fileInput().setInputFiles([join(BEA_DIR, 'make.txt'), join(BEA_DIR, 'use.txt')]);
    await page.locator('#layout-h').waitFor();
    await expect.poll(() => page.getByRole('radio', { name: 'Make table: make.txt' }).isChecked()).toBe(true);
    await page.getByLabel('Scrap commodity code').fill('S004');
    await page.getByRole('combobox', { name: /^Kind of requirements/ }).selectOption('industry-by-industry');
    await screenshot(page, 'workbench-supply-use');
    await page.getByRole('button', { name: 'Read the table' }).click();
    await page.locator('#checks-h').waitFor({ timeout: 30_000 });
    await expect.poll(header).toBe('make.txt + use.txt');
    await nav('Multipliers');
    const sums = new Map<string, number>();
    for (const t of readTriplets('total-requirements-industry-by-industry.txt', 4)) sums.set(t.col, (sums.get(t.col) ?? 0) + t.value);
    const f3 = new Intl.NumberFormat('en-US', { minimumFractionDigits: 3, maximumFractionDigits: 3 });
    for (const code of ['1110', '2302', '3254']) {
      const row = page.locator('#mult-table tbody tr').filter({ has: page.locator('th', { hasText: code }) }).first();
      await expect.poll(() => row.textContent(), { timeout: 20_000 }).toContain(f3.format(sums.get(code)!));
    }
  });

  it.skipIf(!beaAvailable())(`with no scrap typed, proposes the scrap commodity as the command line does: output multipliers are the column sums of Table 8 (source: ${BEA_SOURCE})`, async () => {
    await nav('Open');
    await fileInput().setInputFiles([join(BEA_DIR, 'make.txt'), join(BEA_DIR, 'use.txt')]);
    await page.locator('#layout-h').waitFor();
    await expect.poll(() => page.getByRole('radio', { name: 'Make table: make.txt' }).isChecked()).toBe(true);
    await page.getByLabel('Scrap commodity code').fill('');
    await page.getByRole('combobox', { name: /^Kind of requirements/ }).selectOption('industry-by-industry');
    await page.getByRole('button', { name: 'Read the table' }).click();
    await page.locator('#checks-h').waitFor({ timeout: 30_000 });
    await expect.poll(() => page.locator('body').textContent(), { timeout: 20_000 }).toContain("'S004' is taken for scrap");
    await nav('Multipliers');
    const sums = new Map<string, number>();
    for (const t of readTriplets('total-requirements-industry-by-industry.txt', 4)) sums.set(t.col, (sums.get(t.col) ?? 0) + t.value);
    const f3 = new Intl.NumberFormat('en-US', { minimumFractionDigits: 3, maximumFractionDigits: 3 });
    for (const code of ['1110', '2302', '3254']) {
      const row = page.locator('#mult-table tbody tr').filter({ has: page.locator('th', { hasText: code }) }).first();
      await expect.poll(() => row.textContent(), { timeout: 20_000 }).toContain(f3.format(sums.get(code)!));
    }
  });

  it.skipIf(!beaAvailable())(`reads make and use tables from two sheets of one workbook (source: ${BEA_SOURCE}, Tables 3, 4 and 8)`, async () => {
    // The agency's make and use lines as two sheets of one workbook (codes as text, values as numbers).
    const sheet = (file: string, fields: number) =>
      readFileSync(join(BEA_DIR, file), 'utf8')
        .split(/\r?\n/)
        .filter((l) => l.trim())
        .map((l) => l.split(',').slice(0, fields).map((x, i) => (i < 2 ? x.trim() : Number(x))));
    const book = join(work, 'make-and-use.xlsx');
    writeFileSync(book, await writeWorkbook([{ name: 'Make', rows: sheet('make.txt', 4) }, { name: 'Use', rows: sheet('use.txt', 5) }]));
    await nav('Open');
    await fileInput().setInputFiles(book);
    await page.locator('#layout-h').waitFor();
    await page.getByRole('radio', { name: 'Supply-use tables (make and use)' }).check();
    await page.getByRole('combobox', { name: /^Other sheet/ }).selectOption('Use');
    await page.getByRole('button', { name: 'Use this sheet as the other table' }).click();
    await expect.poll(() => page.getByRole('radio', { name: 'Make table: make-and-use.xlsx (Make)' }).isChecked()).toBe(true);
    await page.getByLabel('Scrap commodity code').fill('S004');
    await page.getByRole('button', { name: 'Read the table' }).click();
    await page.locator('#checks-h').waitFor({ timeout: 30_000 });
    await expect.poll(header).toBe('make-and-use.xlsx (Make + Use)');
    await nav('Multipliers');
    const sums = new Map<string, number>();
    for (const t of readTriplets('total-requirements-industry-by-industry.txt', 4)) sums.set(t.col, (sums.get(t.col) ?? 0) + t.value);
    const f3 = new Intl.NumberFormat('en-US', { minimumFractionDigits: 3, maximumFractionDigits: 3 });
    const row = page.locator('#mult-table tbody tr').filter({ has: page.locator('th', { hasText: '331A' }) }).first();
    await expect.poll(() => row.textContent(), { timeout: 20_000 }).toContain(f3.format(sums.get('331A')!));
    // Numbers in the locale chosen in the settings (German: a decimal comma).
    await page.getByRole('combobox', { name: /^Number format/ }).selectOption('de-DE');
    expect(await page.locator('#locale-sample').textContent()).toBe(new Intl.NumberFormat('de-DE', { maximumFractionDigits: 2 }).format(1234567.891));
    const de = new Intl.NumberFormat('de-DE', { minimumFractionDigits: 3, maximumFractionDigits: 3 });
    await expect.poll(() => page.locator('#mult-table tbody tr').filter({ has: page.locator('th', { hasText: '331A' }) }).first().textContent(), { timeout: 20_000 }).toContain(de.format(sums.get('331A')!));
    await screenshot(page, 'workbench-multipliers-de');
    await page.getByRole('combobox', { name: /^Number format/ }).selectOption('');
  });

  it('a long file of two years: the pair given twice leads to "Keep only lines where", and the year chosen is read', async () => {
    // Invented: three sectors over two years, one line per flow, as statistical downloads list them.
    const S = ['AGR', 'MAN', 'SRV'];
    const lines = ['geo,TIME_PERIOD,prod,induse,OBS_VALUE'];
    for (const [y, year] of ['2019', '2020'].entries()) {
      S.forEach((r, i) => {
        S.forEach((c, j) => lines.push(`XX,${year},${r},${c},${10 * (i + 1) + j + 100 * y}`));
        lines.push(`XX,${year},${r},P3,${500 + 10 * i}`);
      });
      S.forEach((c, j) => lines.push(`XX,${year},D1,${c},${300 + 5 * j}`));
    }
    const path = join(work, 'two-years.csv');
    writeFileSync(path, lines.join('\n') + '\n');
    await nav('Open');
    await fileInput().setInputFiles(path);
    await page.locator('#layout-h').waitFor();
    const alert = page.locator('.problem[role="alert"]');
    await expect.poll(() => alert.textContent()).toMatch(/row 'AGR', column 'AGR' is given a second time/);
    await expect.poll(() => alert.textContent()).toContain("Choose one TIME_PERIOD under 'Keep only lines where' below.");
    await page.getByRole('button', { name: 'Add a condition' }).click();
    const holds = page.getByRole('combobox', { name: /^Holds/ });
    await expect.poll(() => holds.inputValue()).toBe('2020');
    await holds.selectOption('2019');
    await expect.poll(() => page.locator('pre.json').textContent()).toMatch(/"TIME_PERIOD": "2019"/);
    expect(await alert.count()).toBe(0);
    await screenshot(page, 'workbench-long-select');
    await page.getByRole('button', { name: 'Read the table' }).click();
    await page.locator('#checks-h').waitFor();
    await expect.poll(header).toBe('two-years.csv');
    // The same file and year through src/io and the engine in Node.
    const r = await readTableFile(new Uint8Array(readFileSync(path)), { file: 'two-years.csv', long: { select: { TIME_PERIOD: '2019' } } });
    expect(r.table.sectors.codes).toEqual(S);
    const expected = checks(r.table);
    expect(expected.length).toBeGreaterThan(0);
    await expect.poll(() => page.locator('.findings li', { hasText: "only lines with TIME_PERIOD = '2019' are read" }).count()).toBe(1);
    const shown = await page.locator('.findings li').allTextContents();
    for (const f of expected) expect(shown.some((t) => t.includes(f.message)), f.message).toBe(true);
  });

  it('sent no request beyond 127.0.0.1 and raised no page error', () => {
    expect(b.outside).toEqual([]);
    expect(b.errors).toEqual([]);
  });
});
