/**
 * `npm run screenshots [-- --out DIR]`: every step of the workbench at 1440 and 800 pixels wide,
 * as PNG files in DIR (default `screenshots/`, ignored by git), for a person to look at. The site
 * is built and served on 127.0.0.1 as the browser tests do (test/e2e/helpers.ts), in Debian's
 * Chromium (CHROMIUM_PATH or /usr/bin/chromium), with the invented demo economy and its demo
 * scenarios loaded, so that the result views have something to show.
 */
import { mkdirSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { buildSite, chromiumPath, launch, REPO, serveSite } from '../test/e2e/helpers';

const STEPS = ['Projects', 'Checks', 'Edit table', 'Regionalise', 'Balance', 'Coefficients', 'Leontief inverse', 'Multipliers', 'Linkages', 'Scenarios', 'Results', 'Sensitivity', 'Compare projects', 'Report', 'Open'];
const WIDTHS = [1440, 800];

async function main(): Promise<void> {
  const at = process.argv.indexOf('--out');
  const out = resolve(at > 0 && process.argv[at + 1] ? process.argv[at + 1]! : join(REPO, 'screenshots'));
  const chromium = chromiumPath();
  if (!chromium) throw new Error('no Chromium found: set CHROMIUM_PATH, or install Debian\'s package (apt-get install chromium)');
  mkdirSync(out, { recursive: true });
  const site = await buildSite();
  const served = await serveSite(site);
  const b = await launch(chromium, { width: WIDTHS[0]!, height: 900 });
  const page = b.page;
  const written: string[] = [];
  try {
    await page.goto(served.url);
    await page.locator('#checks-h').waitFor({ timeout: 30_000 });
    const nav = async (name: string) => {
      const toggle = page.locator('.nav-toggle');
      if ((await toggle.isVisible()) && (await toggle.getAttribute('aria-expanded')) !== 'true') await toggle.click();
      await page.getByRole('navigation').getByRole('button', { name, exact: true }).click();
    };
    await nav('Scenarios');
    await page.getByRole('button', { name: 'Load the demo scenarios' }).click();
    await page.locator('.pick small', { hasText: 'ready' }).first().waitFor({ timeout: 30_000 });
    for (const width of WIDTHS) {
      await page.setViewportSize({ width, height: 900 });
      for (const step of STEPS) {
        await nav(step);
        await page.waitForTimeout(600);
        await page.waitForFunction(() => !document.querySelector('.busy'), undefined, { timeout: 30_000 }).catch(() => {});
        const path = join(out, `${step.toLowerCase().replace(/\s+/g, '-')}-${width}.png`);
        await page.screenshot({ path, fullPage: true });
        written.push(path);
      }
    }
  } finally {
    await b.close();
    await served.close();
    rmSync(site, { recursive: true, force: true });
  }
  if (b.errors.length) console.warn(`page errors:\n${b.errors.join('\n')}`);
  console.log(`wrote ${written.length} screenshots to ${out}`);
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
