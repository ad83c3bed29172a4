/**
 * The workbench in Debian's Chromium (`npm run bench -- web`): the site is built once with Vite
 * and served on 127.0.0.1; each measure is taken in a real browser and printed with its target.
 *
 * - first view: from navigation start to the demo's Checks panel with its findings, on a first
 *   visit (empty IndexedDB), median of 5 loads; the Multipliers view after a click too;
 * - 400 sectors (engine/synthetic.ts syntheticTable, 4 regions × 100): the worker's checks
 *   ('set-table', the table sent to the worker and checked) and multipliers of every measure,
 *   as the page records them (performance measures rw:<op> around each worker call);
 * - Monte Carlo on the 400-sector table, 300 draws, in the engine worker alone and shared among
 *   two Web Workers (the speed-up is printed; the results are equal, see test/e2e/views.test.ts);
 * - bundle: the entry chunk and what index.html preloads, gzipped, and exceljs in a chunk of its
 *   own that is not fetched until a workbook is opened (requests recorded);
 * - large table: n = 5,000 (10 regions × 500, 12% dense) in a module worker
 *   (src/parallel/large-web-worker.ts, bundled by Vite into a page of its own), at most 15 s
 *   from the table in memory to both answers.
 *
 * Without Chromium (CHROMIUM_PATH or /usr/bin/chromium) it says so and stops. Invented data: it
 * measures speed only.
 */
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { gzipSync } from 'node:zlib';
import { syntheticTable, toPlain } from '../../engine/index';
import { buildSite, chromiumPath, freePort, launch, REPO, serveSite } from '../e2e/helpers';
import { table, target } from './util';

const chromium = chromiumPath();
if (!chromium) {
  console.log('no Chromium found (set CHROMIUM_PATH, or apt-get install chromium): the browser benchmarks were not run');
  process.exit(0);
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const kb = (n: number) => Math.round(n / 102.4) / 10;

const site = await buildSite();
const served = await serveSite(site);
const b = await launch(chromium, { width: 1280, height: 900 });
const page = b.page;
const work = mkdtempSync(join(tmpdir(), 'rw-bench-web-'));

try {
  // ---- Bundle sizes.
  const assets = join(site, 'assets');
  const html = readFileSync(join(site, 'index.html'), 'utf8');
  const entry = [...html.matchAll(/(?:src|href)="\.\/assets\/([^"]+\.js)"/g)].map((m) => m[1]!);
  const all = readdirSync(assets).filter((f) => f.endsWith('.js') || f.endsWith('.css'));
  const sizeRows = all
    .map((f) => {
      const bytes = readFileSync(join(assets, f));
      return { f, raw: statSync(join(assets, f)).size, gz: gzipSync(bytes).length, entry: entry.includes(f) || html.includes(f) };
    })
    .sort((a, c) => c.gz - a.gz);
  table(
    ['chunk', 'KB', 'KB gzipped', 'loaded by index.html'],
    sizeRows.map((r) => [r.f, kb(r.raw), kb(r.gz), r.entry ? 'yes' : 'on demand']),
  );
  const mainGz = sizeRows.filter((r) => r.entry).reduce((s, r) => s + r.gz, 0);
  const excel = sizeRows.find((r) => /exceljs/.test(r.f));

  // ---- First view of the demo on a first visit (median of 5).
  const firstView: number[] = [];
  const requests: string[] = [];
  page.on('request', (r) => requests.push(r.url()));
  for (let k = 0; k < 5; k++) {
    if (k > 0) {
      await page.evaluate(() => new Promise<void>((ok) => {
        const r = indexedDB.deleteDatabase('ripplewise');
        r.onsuccess = r.onerror = r.onblocked = () => ok();
      }));
      await page.goto('about:blank');
    }
    requests.length = 0;
    await page.goto(served.url);
    const t = await page.waitForFunction(() => (document.querySelector('#checks-h') && document.querySelectorAll('.findings li').length > 0 ? performance.now() : 0), undefined, { polling: 'raf', timeout: 30_000 });
    firstView.push(Number(await t.jsonValue()));
  }
  const excelBeforeXlsx = excel ? requests.some((u) => u.includes(excel.f)) : false;
  const t0 = Date.now();
  await page.getByRole('navigation').getByRole('button', { name: 'Multipliers', exact: true }).click();
  await page.locator('#mult-table tbody tr').first().waitFor();
  const multView = Date.now() - t0;

  // ---- 400 sectors: checks and multipliers in the worker.
  const big = join(work, 'synthetic-400.json');
  writeFileSync(big, JSON.stringify(toPlain(syntheticTable({ regions: 4, sectors: 100, seed: 3 }))));
  const ops: { set: number; mult: number }[] = [];
  for (let k = 0; k < 3; k++) {
    await page.evaluate(() => performance.clearMeasures());
    await page.getByRole('navigation').getByRole('button', { name: 'Open', exact: true }).click();
    await page.locator('main input[type=file]').first().setInputFiles(big);
    await page.locator('#checks-h').waitFor({ timeout: 30_000 });
    await page.waitForFunction(() => performance.getEntriesByName('rw:set-table').length > 0);
    await page.getByRole('navigation').getByRole('button', { name: 'Multipliers', exact: true }).click();
    await page.waitForFunction(() => performance.getEntriesByName('rw:multipliers').length > 0, undefined, { timeout: 30_000 });
    const m = await page.evaluate(() => ({ set: performance.getEntriesByName('rw:set-table').at(-1)!.duration, mult: performance.getEntriesByName('rw:multipliers').at(-1)!.duration }));
    ops.push(m);
  }
  const setMs = median(ops.map((o) => o.set));
  const multMs = median(ops.map((o) => o.mult));

  // ---- 400 sectors: Monte Carlo in the engine worker alone and shared among Web Workers.
  await page.getByRole('navigation').getByRole('button', { name: 'Sensitivity', exact: true }).click();
  await page.getByLabel('Draws', { exact: true }).fill('300');
  const mcRuns: [string, number][] = [];
  for (const w of ['1', '2']) {
    await page.evaluate(() => performance.clearMeasures());
    await page.getByRole('combobox', { name: /^Workers/ }).selectOption(w);
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await page.waitForFunction(() => performance.getEntriesByName('rw:monte-carlo').length > 0, undefined, { timeout: 120_000 });
    mcRuns.push([w, await page.evaluate(() => performance.getEntriesByName('rw:monte-carlo').at(-1)!.duration)]);
  }

  // ---- exceljs is fetched once a workbook is opened.
  requests.length = 0;
  await page.getByRole('navigation').getByRole('button', { name: 'Open', exact: true }).click();
  await page.locator('main input[type=file]').first().setInputFiles(join(REPO, 'data-demo/vellan-coast.xlsx'));
  await page.locator('#layout-h').waitFor({ timeout: 30_000 });
  const excelAfterXlsx = excel ? requests.some((u) => u.includes(excel.f)) : false;

  console.log('');
  table(
    ['measure', 'ms', 'runs'],
    [
      ['first view of the demo (Checks) from navigation start, median', Math.round(median(firstView)), firstView.map((x) => Math.round(x)).join(' ')],
      ['Multipliers view after the click', multView, 1],
      ['400 sectors: set-table (send + checks), median', Math.round(setMs), ops.map((o) => Math.round(o.set)).join(' ')],
      ['400 sectors: multipliers of every measure, median', Math.round(multMs), ops.map((o) => Math.round(o.mult)).join(' ')],
      ...mcRuns.map(([w, ms]): [string, number, number] => [`400 sectors: Monte Carlo, 300 draws, ${w === '1' ? 'in the engine worker' : `${w} Web Workers`}`, Math.round(ms), 1]),
    ],
  );
  console.log('');
  target('first view of the demo within 1.5 s of load', median(firstView) <= 1500, `${Math.round(median(firstView))} ms`);
  target('400 sectors: checks and multipliers in the worker at most 1 s', setMs + multMs <= 1000, `${Math.round(setMs)} + ${Math.round(multMs)} ms`);
  console.log(`Monte Carlo speed-up with 2 Web Workers over the engine worker alone: ${(mcRuns[0]![1] / mcRuns[1]![1]).toFixed(2)}× (${availableParallelism()} cores here)`);
  target('main bundle at most 300 KB gzipped', mainGz <= 300 * 1024, `${kb(mainGz)} KB gzipped over ${sizeRows.filter((r) => r.entry).length} file(s)`);
  target(
    'exceljs in its own chunk, fetched only when a workbook is opened',
    !!excel && !excel.entry && !excelBeforeXlsx && excelAfterXlsx,
    excel ? `${excel.f}, ${kb(excel.gz)} KB gzipped; fetched before a workbook: ${excelBeforeXlsx ? 'yes' : 'no'}, after: ${excelAfterXlsx ? 'yes' : 'no'}` : 'no exceljs chunk found',
  );

  // ---- The large-table target in a browser worker.
  const root = mkdtempSync(join(tmpdir(), 'rw-bench-large-'));
  const rel = relative(root, join(REPO, 'src/parallel/large-web-worker.ts')).split('\\').join('/');
  writeFileSync(join(root, 'index.html'), '<!doctype html><meta charset="utf-8"><title>large</title><script type="module" src="./main.ts"></script>');
  writeFileSync(
    join(root, 'main.ts'),
    `const w = new Worker(new URL(${JSON.stringify(rel)}, import.meta.url), { type: 'module' });
(globalThis as any).runLarge = (req: unknown) => new Promise((ok) => { w.onmessage = (e) => ok(e.data); w.postMessage(req); });
`,
  );
  const out = join(root, 'dist');
  mkdirSync(out);
  const { build, preview } = await import('vite');
  await build({ configFile: false, root, logLevel: 'error', worker: { format: 'es' }, build: { outDir: out, emptyOutDir: true, target: 'es2022' } });
  const port = await freePort();
  const server = await preview({ configFile: false, root, logLevel: 'warn', build: { outDir: out }, preview: { host: '127.0.0.1', port, strictPort: true, open: false } });
  try {
    await page.goto(`http://127.0.0.1:${port}/`);
    await page.waitForFunction(() => typeof (globalThis as unknown as { runLarge?: unknown }).runLarge === 'function');
    const r = (await page.evaluate(() => (globalThis as unknown as { runLarge: (q: unknown) => Promise<unknown> }).runLarge({ type: 'large-case', regions: 10, sectors: 500, density: 0.12, seed: 1 }))) as {
      type: string;
      n: number;
      density: number;
      makeMs: number;
      scanMs: number;
      multipliersMs: number;
      impactMs: number;
      totalMs: number;
      kernel?: string;
      multipliers: { method: string; residual: number };
      message?: string;
    };
    if (r.type !== 'large-case-result') throw new Error(`the large case failed in the browser: ${r.message}`);
    console.log('');
    table(
      ['n', 'density', 'make ms', 'scan ms', 'multipliers ms', 'impact ms', 'total ms', 'method', 'residual'],
      [[r.n, `${(100 * r.density).toFixed(1)}%`, r.makeMs, r.scanMs, r.multipliersMs, r.impactMs, r.totalMs, r.multipliers.method, r.multipliers.residual.toExponential(1)]],
    );
    target('n = 5,000 in a browser worker within 15 s', r.totalMs <= 15_000, `${Math.round(r.totalMs)} ms (making the table ${Math.round(r.makeMs)} ms apart)`);
  } finally {
    await server.close();
    rmSync(root, { recursive: true, force: true });
  }
  if (b.outside.length) console.log(`requests beyond 127.0.0.1 (blocked): ${b.outside.join(', ')}`);
} finally {
  await b.close();
  await served.close();
  rmSync(site, { recursive: true, force: true });
  rmSync(work, { recursive: true, force: true });
}
