/**
 * The HTML report in a real Chromium (Debian's, through playwright-core): the strict
 * Content-Security-Policy lets the report's own style apply (its hash is right) and blocks
 * nothing the report needs (no console message), the page makes no request at all, and printing
 * uses the print stylesheet (the contents list hidden) and gives a PDF of several pages.
 * Skipped when no Chromium is installed, except under CI=true (CI installs it).
 */
import { existsSync } from 'node:fs';
import { chromium } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { writeHtml } from '../../src/report/html';
import { hostileReport } from './fixture';

const browser = process.env.CHROMIUM_PATH ?? ['/usr/bin/chromium', '/usr/bin/chromium-browser'].find((p) => existsSync(p));
if (!browser && process.env.CI === 'true') throw new Error('CI=true but no Chromium found: set CHROMIUM_PATH');

describe.skipIf(!browser)('the HTML report in Chromium', () => {
  it('applies its style under the CSP, requests nothing, runs no script, and prints with the print stylesheet', async () => {
    const html = writeHtml(hostileReport({ invented: true }));
    const b = await chromium.launch({ executablePath: browser!, args: ['--no-sandbox'] });
    try {
      const page = await b.newPage();
      const messages: string[] = [];
      const requests: string[] = [];
      let dialogs = 0;
      page.on('console', (m) => messages.push(`${m.type()}: ${m.text()}`));
      page.on('request', (r) => requests.push(r.url()));
      page.on('dialog', (d) => {
        dialogs++;
        void d.dismiss();
      });
      await page.setContent(html, { waitUntil: 'load' });
      expect(messages).toEqual([]);
      expect(requests).toEqual([]);
      expect(dialogs).toBe(0);
      // The style applied: h1 is 1.7rem (27.2 px at the default 16 px); a wrong hash would leave the browser default (32 px).
      expect(await page.evaluate(() => getComputedStyle(document.querySelector('h1')!).fontSize)).toBe('27.2px');
      expect(await page.evaluate(() => document.querySelectorAll('script, img, iframe').length)).toBe(0);
      expect(await page.evaluate(() => document.querySelectorAll('svg').length)).toBeGreaterThan(3);
      await page.emulateMedia({ media: 'print' });
      expect(await page.evaluate(() => getComputedStyle(document.querySelector('nav')!).display)).toBe('none');
      // The policy is live: the same page with a wrong style hash loses its style.
      const tampered = await b.newPage();
      await tampered.setContent(html.replace('style-src &#39;sha256-', 'style-src &#39;sha256-AAAA'), { waitUntil: 'load' });
      expect(await tampered.evaluate(() => getComputedStyle(document.querySelector('h1')!).fontSize)).toBe('32px');
      const pdf = await page.pdf({ format: 'A4' });
      const pages = (Buffer.from(pdf).toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length;
      expect(pages).toBeGreaterThan(3);
    } finally {
      await b.close();
    }
  });
});
