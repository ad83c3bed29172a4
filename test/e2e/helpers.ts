/**
 * Shared pieces of the browser tests: find Debian's Chromium, build the site with Vite's own API
 * into a folder of the test's own, serve it on a free port of 127.0.0.1 with `vite preview`,
 * launch a headless Chromium with a fresh profile, record (and block) every request that would
 * leave 127.0.0.1, and save screenshots under test/e2e/artifacts/ (ignored by git).
 *
 * Each test file builds into its own temporary folder (not dist/web) so that two browser test
 * files, or a build someone runs by hand, never empty each other's output mid-run.
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import type { BrowserContext, Page } from 'playwright-core';

export const REPO = resolve(import.meta.dirname, '../..');
export const ARTIFACTS = join(REPO, 'test/e2e/artifacts');

/** CHROMIUM_PATH, or Debian's /usr/bin/chromium; undefined when neither exists. */
export function chromiumPath(): string | undefined {
  const p = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
  return existsSync(p) ? p : undefined;
}

/**
 * The Chromium to use, or undefined (with a message saying how to get one) so that the caller
 * can skip. Under CI=true a missing browser is an error: CI installs it.
 */
export function requireChromium(what = 'browser tests'): string | undefined {
  const p = chromiumPath();
  if (p) return p;
  const msg = `${what}: no Chromium found (set CHROMIUM_PATH, or install Debian's package: apt-get install chromium)`;
  if (process.env.CI === 'true') throw new Error(`${msg}; CI must run them`);
  console.warn(`skipping ${msg}`);
  return undefined;
}

/** A free TCP port on 127.0.0.1. */
export function freePort(): Promise<number> {
  return new Promise((ok, fail) => {
    const s = createServer();
    s.unref();
    s.on('error', fail);
    s.listen(0, '127.0.0.1', () => {
      const a = s.address();
      const port = typeof a === 'object' && a ? a.port : 0;
      s.close(() => ok(port));
    });
  });
}

/** Build the workbench with Vite's build API into `outDir` (default: a new temporary folder); returns the folder. */
export async function buildSite(outDir = mkdtempSync(join(tmpdir(), 'rw-site-'))): Promise<string> {
  const { build } = await import('vite');
  await build({
    configFile: join(REPO, 'vite.config.ts'),
    root: join(REPO, 'web'),
    logLevel: 'error',
    build: { outDir, emptyOutDir: true },
  });
  return outDir;
}

export interface Served {
  url: string;
  close(): Promise<void>;
}

/** Serve a built site with `vite preview` on 127.0.0.1 (a free port unless one is given). */
export async function serveSite(outDir: string, port?: number): Promise<Served> {
  const { preview } = await import('vite');
  const p = port ?? (await freePort());
  const server = await preview({
    configFile: join(REPO, 'vite.config.ts'),
    root: join(REPO, 'web'),
    logLevel: 'warn',
    build: { outDir },
    preview: { host: '127.0.0.1', port: p, strictPort: true, open: false },
  });
  return {
    url: `http://127.0.0.1:${p}/`,
    close: () => server.close(),
  };
}

/** The built workbench served on 127.0.0.1 with a browser; `close` ends all three and removes the build. */
export interface Workbench {
  served: Served;
  browser: Browser;
  close(): Promise<void>;
}

/** Build the workbench, serve it and launch the browser (what every browser test starts with). */
export async function openWorkbench(executablePath: string, options: Parameters<typeof launch>[1] = {}): Promise<Workbench> {
  const site = await buildSite();
  let served: Served | undefined;
  const remove = async () => {
    await served?.close();
    rmSync(site, { recursive: true, force: true });
  };
  try {
    served = await serveSite(site);
    const browser = await launch(executablePath, options);
    const s = served;
    return {
      served: s,
      browser,
      async close() {
        await browser.close();
        await remove();
      },
    };
  } catch (e) {
    await remove();
    throw e;
  }
}

export interface Browser {
  context: BrowserContext;
  page: Page;
  /** Every request that tried to leave 127.0.0.1 (it was blocked). */
  outside: string[];
  /** Errors thrown in the page and console errors. */
  errors: string[];
  close(): Promise<void>;
}

/** Whether a URL stays on the machine: 127.0.0.1, or data:, blob: and about: URLs. */
export function isLocal(url: string): boolean {
  if (/^(data|blob|about):/.test(url)) return true;
  try {
    const u = new URL(url);
    return u.hostname === '127.0.0.1';
  } catch {
    return false;
  }
}

/** Launch headless Chromium with a fresh profile; requests that would leave 127.0.0.1 are blocked and recorded. */
export async function launch(executablePath: string, options: { width?: number; height?: number; colorScheme?: 'light' | 'dark' } = {}): Promise<Browser> {
  const { chromium } = await import('playwright-core');
  const profile = mkdtempSync(join(tmpdir(), 'rw-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run'],
    viewport: { width: options.width ?? 1280, height: options.height ?? 900 },
    colorScheme: options.colorScheme ?? 'light',
    acceptDownloads: true,
  });
  const outside: string[] = [];
  const errors: string[] = [];
  await context.route('**/*', (route) => {
    const url = route.request().url();
    if (isLocal(url)) return route.continue();
    outside.push(url);
    return route.abort('blockedbyclient');
  });
  context.on('request', (r) => {
    if (!isLocal(r.url()) && !outside.includes(r.url())) outside.push(r.url());
  });
  const page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (e) => errors.push(`page error: ${e.message}`));
  page.on('console', (m) => {
    if (m.type() === 'error') errors.push(`console: ${m.text()}`);
  });
  return {
    context,
    page,
    outside,
    errors,
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Save a full-page screenshot as test/e2e/artifacts/<name>.png. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(ARTIFACTS, { recursive: true });
  const path = join(ARTIFACTS, `${name}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}
