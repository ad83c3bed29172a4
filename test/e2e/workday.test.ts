/**
 * A practitioner's working day in Debian's Chromium: two projects in the browser and switching
 * between them (the first one's scenarios stay its own), the header naming a file still at the
 * Layout step, the source file kept so that a finding shows its cell after a reload, the
 * scenario builder's messages only once a field was left, the banner on every view of a table
 * that failed its checks, the tidy CSV read back, and the steps folded at 800 px.
 *
 * The tidy CSV's output effects are compared with ml-matrix 6.15.1 (an independent
 * general-purpose library): direct + indirect output by sector = (I − A)⁻¹ Δd. The demo economy
 * and the failing two-sector table are invented and prove nothing about economics.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { execFileSync } from 'node:child_process';
import type { Download, Page } from 'playwright-core';
import Papa from 'papaparse';
import { inverse as mlInverse, Matrix as MlMatrix } from 'ml-matrix';
import { checks, makeTable, measures } from '../../engine/index';
import type { PlainTable } from '../../engine/index';
import { readTableFile } from '../../src/io/index';
import { readScenarios } from '../../src/project/scenarios';
import type { Browser, Served, Workbench } from './helpers';
import { openWorkbench, REPO, requireChromium, screenshot } from './helpers';

const chromium = requireChromium('the working-day browser test');

describe.skipIf(!chromium)('the workbench in Chromium: projects, validation, banner, tidy CSV, narrow screens', () => {
  let wb: Workbench | undefined;
  let served: Served;
  let b: Browser;
  let page: Page;
  let work: string;
  let csvPath: string;
  let failingPath: string;

  const nav = async (name: string) => {
    const toggle = page.locator('.nav-toggle');
    if (await toggle.isVisible()) {
      if ((await toggle.getAttribute('aria-expanded')) !== 'true') await toggle.click();
    }
    await page.getByRole('navigation').getByRole('button', { name, exact: true }).click();
  };
  const header = () => page.locator('header .table-name').textContent();
  const saved = () => expect.poll(() => page.locator('header .autosave').textContent(), { timeout: 10_000 }).toBe('Saved in this browser');
  const fileInput = () => page.locator('main input[type=file]').first();
  const DEMO = 'Vellan Coast (invented demo)';

  async function downloaded(click: () => Promise<void>): Promise<{ d: Download; text: string }> {
    const wait = page.waitForEvent('download', { timeout: 30_000 });
    await click();
    const d = await wait;
    const path = join(work, d.suggestedFilename());
    await d.saveAs(path);
    return { d, text: readFileSync(path, 'utf8') };
  }

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'rw-e2e-day-'));
    // The demo CSV with one flow raised by 40, so that FISH no longer balances (a finding with a cell).
    const lines = readFileSync(join(REPO, 'data-demo/vellan-coast.csv'), 'utf8').split('\n');
    const at = lines.findIndex((l) => l.startsWith('FISH,'));
    const c = lines[at]!.split(',');
    c[5] = String(Number(c[5]) + 40);
    lines[at] = c.join(',');
    csvPath = join(work, 'coast-edited.csv');
    writeFileSync(csvPath, lines.join('\n'));
    // Two invented sectors; Agri buys 110 of inputs per 100 of output (technical coefficients sum past 1).
    const failing: PlainTable = {
      sectors: { codes: ['AGR', 'BLD'], labels: ['Agri', 'Build'] },
      Z: [
        [60, 20],
        [50, 10],
      ],
      finalDemand: { codes: ['HH'], labels: ['Households'], values: [[10], [5]] },
      valueAdded: { codes: ['W'], labels: ['Wages'], values: [[5, 10]] },
      x: [100, 40],
      meta: { title: 'Failing two-sector table (invented)' },
    };
    expect(checks(makeTable(failing)).some((f) => f.severity === 'error')).toBe(true);
    failingPath = join(work, 'failing.json');
    writeFileSync(failingPath, JSON.stringify(failing));
    wb = await openWorkbench(chromium!, { width: 1440, height: 900 });
    ({ served, browser: b } = wb);
    page = b.page;
  }, 240_000);

  afterAll(async () => {
    await wb?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('opens the demo as the first project, listed with its table, last change and size', async () => {
    await page.goto(served.url);
    await expect.poll(header, { timeout: 20_000 }).toBe(DEMO);
    // The first-visit guide: two ways on, and one line per step.
    const guide = page.getByRole('complementary', { name: 'Welcome to Ripplewise' });
    await guide.waitFor();
    expect(await guide.locator('li').count()).toBeGreaterThanOrEqual(4);
    await screenshot(page, 'day-guide');
    await guide.getByRole('button', { name: 'Explore the demo' }).click();
    await page.locator('#mult-table').waitFor();
    expect(await guide.count()).toBe(0);
    await saved();
    await nav('Projects');
    const rows = page.locator('table.projects tbody tr');
    await expect.poll(() => rows.count()).toBe(1);
    const text = (await rows.first().textContent())!;
    expect(text).toContain(DEMO);
    expect(text).toMatch(/\d+ sectors/);
    expect(text).toMatch(/\d+(\.\d)? (KB|B|MB)/);
    expect(text).toMatch(/\(open\)/);
  });

  it('shows a new change\'s problems only once a field of it was left, not when it is added', async () => {
    await nav('Scenarios');
    await page.getByRole('button', { name: 'Add a scenario' }).click();
    await page.locator('#sector-search').fill('FOOD');
    await page.locator('#sector-search').press('Enter');
    const value = page.getByLabel(/^Change 1: amount in/);
    await value.waitFor();
    // The engine has checked it (the list says so), yet no message is shown in the row or below.
    await expect.poll(() => page.locator('.pick small.bad').count()).toBe(1);
    expect(await page.locator('.problems').count()).toBe(0);
    expect(await page.getByText(/give either an amount or a percentage/).count()).toBe(0);
    await screenshot(page, 'day-scenario-fresh');
    // Leaving the field empty: now the message shows.
    await value.focus();
    await page.keyboard.press('Tab');
    await expect.poll(() => page.locator('.problems').textContent()).toMatch(/give either an amount or a percentage/);
    await value.fill('10');
    await expect.poll(() => page.locator('.pick small', { hasText: 'ready' }).count()).toBe(1);
    await saved();
  });

  it('a file waiting at the Layout step is named in the header; reading it starts a second project', async () => {
    await nav('Open');
    await fileInput().setInputFiles(csvPath);
    await page.locator('#layout-h').waitFor();
    expect(await header()).toBe(`Reading coast-edited.csv: layout not confirmed (open now: ${DEMO})`);
    await page.getByRole('button', { name: 'Read the table' }).click();
    await page.locator('#checks-h').waitFor();
    await expect.poll(header).toBe('coast-edited.csv');
    await nav('Scenarios');
    await expect.poll(() => page.locator('.pick').count()).toBe(0);
    await saved();
    await nav('Projects');
    await expect.poll(() => page.locator('table.projects tbody tr').count()).toBe(2);
    const names = await page.locator('table.projects tbody th').allTextContents();
    expect(names.some((n) => n.startsWith('coast-edited.csv') && n.includes('(open)'))).toBe(true);
    expect(names.some((n) => n === DEMO)).toBe(true);
    await screenshot(page, 'day-projects');
  });

  it('after a reload the project is back with its source file: a finding still shows its cell', async () => {
    await page.reload();
    await expect.poll(header, { timeout: 20_000 }).toBe('coast-edited.csv');
    // The guide, once dismissed, never returns.
    expect(await page.locator('.guide').count()).toBe(0);
    await nav('Checks');
    const r = await readTableFile(new Uint8Array(readFileSync(csvPath)), { file: 'coast-edited.csv' });
    const cell = [...r.findings, ...checks(r.table)].find((f) => f.code === 'total-mismatch')!.where!.cell!;
    await page.locator('.findings li', { hasText: 'total-mismatch' }).getByRole('button').click();
    await expect.poll(() => page.locator('.cell h3').textContent()).toBe(`file coast-edited.csv, cell ${cell}`);
    await expect.poll(() => page.locator('.preview td[aria-current="true"]').getAttribute('data-cell')).toBe(cell);
  });

  it('switches back to the demo project with its own scenario, and writes the tidy CSV that ml-matrix confirms', async () => {
    await nav('Projects');
    await page.locator('table.projects tbody tr', { hasText: DEMO }).getByRole('button', { name: 'Open' }).click();
    await expect.poll(header).toBe(DEMO);
    await nav('Scenarios');
    await expect.poll(() => page.locator('.pick').count()).toBe(1);
    await nav('Report');
    const tidy = await downloaded(() => page.getByRole('button', { name: 'Download tidy CSV of the impacts' }).click());
    expect(tidy.d.suggestedFilename()).toMatch(/\.tidy\.csv$/);
    expect(tidy.text).toMatch(/^# .*\n/);
    expect(tidy.text).toMatch(/not a forecast/i);
    const parsed = Papa.parse<Record<string, string>>(tidy.text, { header: true, comments: '#', skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields).toEqual(['scenario', 'sector', 'measure', 'effect', 'value', 'unit']);
    const rows = parsed.data;
    expect(new Set(rows.map((x) => x.effect))).toEqual(new Set(['direct', 'indirect', 'induced', 'total']));
    const table = makeTable(JSON.parse(readFileSync(join(REPO, 'data-demo/vellan-coast.table.json'), 'utf8')) as PlainTable);
    const n = table.x.length;
    const M = new MlMatrix(n, n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) M.set(i, j, (i === j ? 1 : 0) - table.Z.data[i * n + j]! / table.x[j]!);
    const L = mlInverse(M);
    const food = table.sectors.codes.indexOf('FOOD');
    const out = rows.filter((x) => x.measure === 'output');
    expect(out.length).toBe(n * 4);
    for (let i = 0; i < n; i++) {
      const code = table.sectors.codes[i]!;
      const v = (e: string) => Number(out.find((x) => x.sector === code && x.effect === e)!.value);
      expect(Math.abs(v('direct') + v('indirect') - 10 * L.get(i, food))).toBeLessThan(1e-9);
      expect(Math.abs(v('direct') + v('indirect') + v('induced') - v('total'))).toBeLessThan(1e-9);
    }
  });

  it('puts two projects side by side: output multipliers and their differences, as ml-matrix gives them', async () => {
    await nav('Compare projects');
    const pick = page.getByLabel('Project to compare with');
    const option = (await pick.locator('option').allTextContents()).find((o) => o.includes('coast-edited.csv'))!;
    await pick.selectOption({ label: option });
    await page.locator('#cmp-table tbody tr').first().waitFor();
    // Multipliers of a measure with coefficients c (1 for output): simple_j = Σᵢ cᵢ Lᵢⱼ, L from ml-matrix.
    const mult = (t: { x: Float64Array; Z: { data: Float64Array } }, c?: ArrayLike<number>) => {
      const n = t.x.length;
      const M = new MlMatrix(n, n);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) M.set(i, j, (i === j ? 1 : 0) - t.Z.data[i * n + j]! / t.x[j]!);
      const L = mlInverse(M);
      return Array.from({ length: n }, (_, j) => Array.from({ length: n }, (_, i) => (c ? c[i]! : 1) * L.get(i, j)).reduce((a, b) => a + b, 0));
    };
    // Half a unit in the last place shown (one rule for digits: src/report/charts/format.ts).
    const tol = (t: string) => 0.5 * 10 ** -(t.split('.')[1]?.length ?? 0) + 1e-12;
    const demo = makeTable(JSON.parse(readFileSync(join(REPO, 'data-demo/vellan-coast.table.json'), 'utf8')) as PlainTable);
    const edited = (await readTableFile(new Uint8Array(readFileSync(csvPath)), { file: 'coast-edited.csv' })).table;
    const a = mult(demo);
    const bm = mult(edited);
    const rows = page.locator('#cmp-table tbody tr');
    expect(await rows.count()).toBe(demo.sectors.codes.length);
    const num = (t: string) => Number(t.replace(/,/g, ''));
    let differs = 0;
    for (const [k, code] of demo.sectors.codes.entries()) {
      const cells = await rows.filter({ has: page.locator('th', { hasText: new RegExp(`^${code}$`) }) }).locator('td').allTextContents();
      expect(Math.abs(num(cells[1]!) - a[k]!), code).toBeLessThanOrEqual(tol(cells[1]!));
      const j = edited.sectors.codes.indexOf(code);
      expect(Math.abs(num(cells[2]!) - bm[j]!), code).toBeLessThanOrEqual(tol(cells[2]!));
      expect(Math.abs(num(cells[3]!) - (a[k]! - bm[j]!)), code).toBeLessThanOrEqual(tol(cells[3]!));
      if (Math.abs(a[k]! - bm[j]!) > 1e-4) differs++;
    }
    expect(differs).toBeGreaterThan(0);
    // Every measure and Type I: a measure other than output, Type I = simple ÷ direct (the measure's coefficient).
    const measure = page.getByLabel('Measure to compare');
    const labels = await measure.locator('option').allTextContents();
    expect(labels.length).toBeGreaterThan(1);
    const mDemo = measures(demo).find((m) => m.code !== 'output' && labels.includes(m.label))!;
    const mEdited = measures(edited).find((m) => m.code === mDemo.code)!;
    await measure.selectOption({ label: mDemo.label });
    const kind = page.getByLabel('Multiplier to compare');
    expect(await kind.locator('option').allTextContents()).toEqual(expect.arrayContaining(['Simple (direct + indirect)', 'Type I (simple ÷ direct)']));
    await kind.selectOption({ label: 'Type I (simple ÷ direct)' });
    await expect.poll(() => page.locator('#cmp-table caption').textContent()).toMatch(new RegExp(`type i \\(simple ÷ direct\\), side by side`));
    const sa = mult(demo, mDemo.coefficients);
    const sb = mult(edited, mEdited.coefficients);
    let checked = 0;
    const typeI = new Map<string, number>();
    for (const [k, code] of demo.sectors.codes.entries()) {
      const j = edited.sectors.codes.indexOf(code);
      const ca = mDemo.coefficients[k]!;
      const cb = mEdited.coefficients[j]!;
      if (!(ca > 0 && cb > 0)) continue;
      const cells = await rows.filter({ has: page.locator('th', { hasText: new RegExp(`^${code}$`) }) }).locator('td').allTextContents();
      expect(Math.abs(num(cells[1]!) - sa[k]! / ca), `${code} Type I here`).toBeLessThanOrEqual(tol(cells[1]!));
      typeI.set(code, sa[k]! / ca);
      expect(Math.abs(num(cells[2]!) - sb[j]! / cb), `${code} Type I other`).toBeLessThanOrEqual(tol(cells[2]!));
      expect(Math.abs(num(cells[3]!) - (sa[k]! / ca - sb[j]! / cb)), `${code} difference`).toBeLessThanOrEqual(tol(cells[3]!) + tol(cells[1]!));
      checked++;
    }
    expect(checked).toBeGreaterThan(5);
    // With a household closure on both sides, Type II is offered too.
    if ((await kind.locator('option').allTextContents()).includes('Type II (total ÷ direct)')) {
      await kind.selectOption({ label: 'Type II (total ÷ direct)' });
      await expect.poll(() => page.locator('#cmp-table caption').textContent()).toMatch(/type ii/);
      // Type II is at least Type I where both are defined: households add induced effects, never take
      // any away (common practice).
      for (const [code, v] of typeI) {
        const cells = await rows.filter({ has: page.locator('th', { hasText: new RegExp(`^${code}$`) }) }).locator('td').allTextContents();
        expect(num(cells[1]!), `${code} Type II ≥ Type I`).toBeGreaterThanOrEqual(v - tol(cells[1]!));
      }
    }
    await screenshot(page, 'day-compare');
  });

  it('shows the failed-checks banner on every view of a failing table, with a way to the checks', async () => {
    await nav('Open');
    await fileInput().setInputFiles(failingPath);
    await page.locator('#checks-h').waitFor();
    await expect.poll(header).toBe('failing.json');
    const banner = page.locator('.failed-banner');
    await expect.poll(() => banner.textContent()).toMatch(/This table failed its checks:.*sum to 1 or more.*Results below cannot be trusted/s);
    for (const step of ['Multipliers', 'Coefficients', 'Linkages', 'Scenarios', 'Report']) {
      await nav(step);
      await expect.poll(() => banner.textContent(), { message: step }).toMatch(/This table failed its checks:.*Results below cannot be trusted/s);
    }
    await nav('Multipliers');
    await screenshot(page, 'day-banner');
    await banner.getByRole('button', { name: 'See the checks' }).click();
    await page.locator('#checks-h').waitFor();
    // The demo (no error finding) has no banner.
    await nav('Projects');
    await page.locator('table.projects tbody tr', { hasText: DEMO }).getByRole('button', { name: 'Open' }).click();
    await expect.poll(header).toBe(DEMO);
    await nav('Multipliers');
    expect(await banner.count()).toBe(0);
  });

  it('undoes and redoes a table edit and a scenario edit, each named, with the buttons and Ctrl+Z / Ctrl+Shift+Z', async () => {
    // The demo project is open (its one scenario: FOOD, amount 10).
    await nav('Edit table');
    await page.getByLabel('Row of the cell').selectOption('s:FOOD');
    await page.getByLabel('Column of the cell').selectOption('s:HOSP');
    const now = page.locator('.now output');
    const table = JSON.parse(readFileSync(join(REPO, 'data-demo/vellan-coast.table.json'), 'utf8')) as PlainTable;
    const codes = table.sectors.codes;
    const before = table.Z[codes.indexOf('FOOD')]![codes.indexOf('HOSP')]!;
    await expect.poll(() => now.textContent()).toBe(String(Number(before.toPrecision(6))));
    await page.getByLabel('New value').fill('14');
    await page.getByRole('button', { name: 'Change the cell' }).click();
    const label = `FOOD → HOSP flow ${Number(before.toPrecision(6))} → 14`;
    await expect.poll(() => page.locator('ol.edits li').allTextContents()).toEqual([label]);
    await expect.poll(() => now.textContent()).toBe('14');
    const undoBtn = page.locator('.history button').first();
    const redoBtn = page.locator('.history button').nth(1);
    await expect.poll(() => undoBtn.getAttribute('title')).toBe(`undo: ${label} (Ctrl+Z)`);
    // A scenario edit: the amount 10 → 25.
    await nav('Scenarios');
    const value = page.getByLabel(/^Change 1: amount in/);
    await value.fill('25');
    await page.locator('#scen-h').click();
    await expect.poll(() => undoBtn.getAttribute('title')).toMatch(/^undo: scenario '.+' change 1 \(FOOD\) amount 10 → 25 \(Ctrl\+Z\)$/);
    await screenshot(page, 'day-undo');
    // Ctrl+Z: the scenario edit is undone first, then the table edit.
    await page.keyboard.press('Control+z');
    await expect.poll(() => value.inputValue()).toBe('10');
    await expect.poll(() => page.locator('.history .said').textContent()).toMatch(/^Undone: scenario .* amount 10 → 25$/);
    await expect.poll(() => undoBtn.getAttribute('title')).toBe(`undo: ${label} (Ctrl+Z)`);
    await undoBtn.click();
    await expect.poll(() => redoBtn.getAttribute('title')).toBe(`redo: ${label} (Ctrl+Shift+Z)`);
    await nav('Edit table');
    await expect.poll(() => page.locator('ol.edits li').count()).toBe(0);
    await page.getByLabel('Row of the cell').selectOption('s:FOOD');
    await page.getByLabel('Column of the cell').selectOption('s:HOSP');
    await expect.poll(() => now.textContent()).toBe(String(Number(before.toPrecision(6))));
    // Ctrl+Shift+Z redoes the table edit, then the scenario edit.
    await page.locator('#edit-h').click();
    await page.keyboard.press('Control+Shift+z');
    await expect.poll(() => now.textContent()).toBe('14');
    await page.keyboard.press('Control+Shift+z');
    await nav('Scenarios');
    await expect.poll(() => value.inputValue()).toBe('25');
    // Back to the table as read, for the merge below.
    await page.locator('#scen-h').click();
    await page.keyboard.press('Control+z');
    await page.keyboard.press('Control+z');
    await expect.poll(() => redoBtn.getAttribute('title')).toMatch(/^redo: FOOD → HOSP/);
  });

  it('merges sectors into a group with the same multipliers as the command line\'s aggregate', async () => {
    const conc = join(work, 'groups.csv');
    const table = JSON.parse(readFileSync(join(REPO, 'data-demo/vellan-coast.table.json'), 'utf8')) as PlainTable;
    writeFileSync(conc, ['code,group,label', ...table.sectors.codes.map((c) => (c === 'FISH' || c === 'FORE' ? `${c},PRIM,Fishing and forestry` : `${c},${c},`))].join('\n') + '\n');
    const agg = join(work, 'aggregated.json');
    const cli = (args: string[]) => execFileSync(process.execPath, [join(REPO, 'bin/ripplewise.mjs'), ...args], { encoding: 'utf8' });
    cli(['aggregate', join(REPO, 'data-demo/vellan-coast.table.json'), '--concordance', conc, '--out', agg]);
    const expected = JSON.parse(cli(['multipliers', agg, '--json'])) as { measures: { code: string; sectors: { code: string; simple: number; total?: number }[] }[] };
    await nav('Edit table');
    const choose = page.getByRole('group', { name: 'Sectors to merge' });
    await choose.getByLabel(/^Merge FISH /).check();
    await choose.getByLabel(/^Merge FORE /).check();
    await page.getByLabel('Group code').fill('PRIM');
    await page.getByLabel('Group name').fill('Fishing and forestry');
    await page.getByRole('button', { name: 'Merge 2 sectors' }).click();
    await expect.poll(() => page.locator('ol.edits li').allTextContents()).toEqual(['merge FISH + FORE → PRIM']);
    await nav('Multipliers');
    await expect.poll(() => page.locator('#mult-table tbody tr').count()).toBe(15);
    expect(await page.locator('#mult-table tbody').textContent()).toContain('Fishing and forestry');
    // Every digit: the JSON report's multipliers against the command line's.
    await nav('Report');
    const rep = await downloaded(() => page.getByRole('button', { name: 'Download JSON' }).click());
    const json = JSON.parse(rep.text);
    expect(json.sections.find((s: { id: string }) => s.id === 'edits').paragraphs).toEqual(['1. merge FISH + FORE → PRIM']);
    const mt = json.sections.find((s: { kind: string }) => s.kind === 'multipliers').tables[0];
    const col = (re: RegExp) => mt.columns.findIndex((c: { key: string }) => re.test(c.key));
    const out = expected.measures.find((m) => m.code === 'output')!;
    expect(mt.rows.length).toBe(out.sectors.length);
    for (const s of out.sectors) {
      const row = mt.rows.find((x: unknown[]) => x[0] === s.code);
      expect(Math.abs(row[col(/simple/i)] - s.simple), s.code).toBeLessThan(1e-9);
      if (s.total !== undefined && col(/^total/i) >= 0) expect(Math.abs(row[col(/^total/i)] - s.total), s.code).toBeLessThan(1e-9);
    }
    // Undo splits the group back.
    await page.locator('.history button').first().click();
    await nav('Multipliers');
    await expect.poll(() => page.locator('#mult-table tbody tr').count()).toBe(16);
  });

  it('imports the command line\'s scenarios file and exports one that reads back the same and that the command line takes', async () => {
    const demoFile = join(REPO, 'data-demo/scenarios.json');
    const original = readScenarios(readFileSync(demoFile, 'utf8'), 'scenarios.json');
    await nav('Projects');
    await page.getByRole('button', { name: 'New empty project' }).click();
    await nav('Open');
    await page.getByRole('button', { name: 'Open the demo economy' }).click();
    await expect.poll(header).toBe(DEMO);
    await nav('Scenarios');
    await expect.poll(() => page.locator('.pick').count()).toBe(0);
    await page.getByLabel('Import a scenarios file').setInputFiles(demoFile);
    await expect.poll(() => page.locator('.pick').count()).toBe(original.length);
    await expect.poll(() => page.locator('.pick small', { hasText: 'ready' }).count()).toBe(original.length);
    const exported = await downloaded(() => page.getByRole('button', { name: 'Export the scenarios file' }).click());
    expect(exported.d.suggestedFilename()).toBe('scenarios.json');
    expect(readScenarios(exported.text, 'exported.json')).toEqual(original);
    // The command line reads the exported file and gives the same impacts as from its own.
    const path = join(work, 'exported-scenarios.json');
    writeFileSync(path, exported.text);
    const cli = (f: string) => JSON.parse(execFileSync(process.execPath, [join(REPO, 'bin/ripplewise.mjs'), 'impact', join(REPO, 'data-demo/vellan-coast.table.json'), '--scenario', f, '--json'], { encoding: 'utf8' }));
    const a = cli(demoFile);
    const b = cli(path);
    delete a.file, delete b.file, delete a.sha256, delete b.sha256;
    expect(JSON.stringify(b.scenarios ?? b.impacts ?? b)).toBe(JSON.stringify(a.scenarios ?? a.impacts ?? a));
    // A file that is not a scenarios file is refused with its name, and nothing is lost.
    const bad = join(work, 'not-scenarios.json');
    writeFileSync(bad, '{"format":"something-else"}');
    await page.getByLabel('Import a scenarios file').setInputFiles(bad);
    await expect.poll(() => page.locator('main > .error[role="alert"]').textContent()).toMatch(/not-scenarios\.json/);
    expect(await page.locator('.pick').count()).toBe(original.length);
  });

  it('shows the Leontief inverse as a heat map and a searchable table whose cells are explained, as ml-matrix gives them', async () => {
    await nav('Leontief inverse');
    await page.locator('#inv-table tbody tr').first().waitFor();
    expect(await page.locator('#inv-h ~ figure, #inv-h ~ * svg, #inv-h ~ * canvas').count()).toBeGreaterThan(0);
    await page.getByLabel('Find a sector (code or name)').fill('HOSP');
    const table = makeTable(JSON.parse(readFileSync(join(REPO, 'data-demo/vellan-coast.table.json'), 'utf8')) as PlainTable);
    const n = table.x.length;
    // Every cell with HOSP as producer or as the demand: 2n − 1.
    await expect.poll(() => page.locator('#inv-table tbody tr').count()).toBe(2 * n - 1);
    const M = new MlMatrix(n, n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) M.set(i, j, (i === j ? 1 : 0) - table.Z.data[i * n + j]! / table.x[j]!);
    const L = mlInverse(M);
    const h = table.sectors.codes.indexOf('HOSP');
    const f = table.sectors.codes.indexOf('FOOD');
    const row = page.locator('#inv-table tbody tr').filter({ has: page.locator('th', { hasText: /^FOOD$/ }) }).filter({ has: page.locator('td', { hasText: /^HOSP$/ }) });
    const cells = await row.locator('td').allTextContents();
    expect(Math.abs(Number(cells[1]!.replace(/,/g, '')) - L.get(f, h))).toBeLessThan(5e-5);
    expect(cells[2]).toMatch(/^per 1 EUR millions more of final demand for .+ \(HOSP\), .+ \(FOOD\) produces [\d.]+ EUR millions more$/);
    await screenshot(page, 'day-inverse');
  });

  it('prints the current view without the controls (print stylesheet), from a Print button', async () => {
    expect(await page.getByRole('button', { name: 'Print' }).count()).toBe(1);
    await nav('Multipliers');
    await page.locator('#mult-table').waitFor();
    await page.emulateMedia({ media: 'print' });
    expect(await page.getByRole('navigation').isVisible()).toBe(false);
    expect(await page.getByRole('button', { name: 'Save project' }).isVisible()).toBe(false);
    expect(await page.locator('main h2').first().isVisible()).toBe(true);
    expect(await page.locator('#mult-table').isVisible()).toBe(true);
    expect(await page.getByRole('complementary', { name: 'Cautions' }).first().isVisible()).toBe(true);
    const pdf = await page.pdf({ format: 'A4' });
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    writeFileSync(join(work, 'multipliers.pdf'), pdf);
    await page.emulateMedia({ media: 'screen' });
    expect(await page.getByRole('navigation').isVisible()).toBe(true);
  });

  it('shows each scenario across all measures as small multiples, with a legend and each total', async () => {
    // The demo project now holds the command line's three scenarios (imported above).
    await nav('Results');
    const fig = page.locator('figure.multiples');
    await fig.waitFor();
    expect(await fig.locator('.legend li').allTextContents()).toEqual(['Direct', 'Indirect', 'Induced']);
    const measures = await fig.locator('thead th').count();
    expect(measures).toBeGreaterThan(3);
    const rows = fig.locator('tbody tr');
    expect(await rows.count()).toBe(3);
    // Each cell names its scenario, measure and total; the output total of the first scenario is in the totals table too.
    const label = await rows.first().locator('svg').first().getAttribute('aria-label');
    expect(label).toMatch(/^.+, Output: total [\d.,-]+ .+ \(direct .+, indirect .+, induced .+\)$/);
    await screenshot(page, 'day-small-multiples');
  });

  it('folds the steps behind a button at 800 px and shows them again at 1440 px', async () => {
    await page.setViewportSize({ width: 800, height: 900 });
    const toggle = page.locator('.nav-toggle');
    await expect.poll(() => toggle.isVisible()).toBe(true);
    const list = page.locator('#steps-list');
    expect(await list.isVisible()).toBe(false);
    // The view takes the whole width below the bar.
    const main = await page.locator('main').boundingBox();
    expect(main!.x).toBeLessThan(5);
    expect(main!.width).toBeGreaterThan(780);
    await toggle.click();
    expect(await toggle.getAttribute('aria-expanded')).toBe('true');
    expect(await list.isVisible()).toBe(true);
    await screenshot(page, 'day-800-open-nav');
    await page.getByRole('navigation').getByRole('button', { name: 'Linkages', exact: true }).click();
    await page.locator('#link-h, h2:has-text("Linkages")').first().waitFor();
    expect(await list.isVisible()).toBe(false);
    expect(await toggle.textContent()).toMatch(/Steps: Linkages/);
    // Nothing sticks out sideways at 800 px.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(800);
    await screenshot(page, 'day-800');
    await page.setViewportSize({ width: 1440, height: 900 });
    await expect.poll(() => toggle.isVisible()).toBe(false);
    expect(await list.isVisible()).toBe(true);
  });

  it('changes a sector\'s code in the Edit table step, logged, refused when it clashes, undone and redone', async () => {
    await nav('Edit table');
    const pick = page.getByLabel('Sector whose code to change');
    const values = () => pick.locator('option').evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value));
    const before = await values();
    const [from, other] = before as [string, string];
    // A code already in use (in another case) is refused with a message naming it; the table stays.
    await page.getByLabel('New code').fill(other.toLowerCase());
    await page.getByRole('button', { name: 'Change the code' }).click();
    await expect.poll(() => page.getByText(`is already used by sector ${other}`).count()).toBeGreaterThan(0);
    expect(await values()).toEqual(before);
    await page.getByLabel('New code').fill('NEWCODE');
    await page.getByRole('button', { name: 'Change the code' }).click();
    await expect.poll(values).toEqual(before.map((c) => (c === from ? 'NEWCODE' : c)));
    await expect.poll(() => page.getByText(`code ${from} → NEWCODE`).count()).toBeGreaterThan(0);
    const undo = page.getByRole('button', { name: 'Undo', exact: true });
    await expect.poll(() => undo.getAttribute('title')).toMatch(new RegExp(`code ${from} → NEWCODE`));
    await undo.click();
    await expect.poll(values).toEqual(before);
    await page.getByRole('button', { name: 'Redo', exact: true }).click();
    await expect.poll(values).toEqual(before.map((c) => (c === from ? 'NEWCODE' : c)));
    await undo.click();
    await expect.poll(values).toEqual(before);
  });

  it('raised no page error and sent no request beyond 127.0.0.1', () => {
    expect(b.errors).toEqual([]);
    expect(b.outside).toEqual([]);
  });
});
