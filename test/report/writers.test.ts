/**
 * The report writers: the numbers in the HTML, the XLSX and the CSV are those of the JSON (each
 * parsed back: HTML by its markup, XLSX with exceljs, CSV with papaparse, the JSON with
 * JSON.parse), blanks stay blank, text stays text, and a corpus of script and formula payloads in
 * every label comes out inert: escaped in HTML, neutralised in CSV and XLSX, with negative numbers
 * still numbers.
 */
import { createHash } from 'node:crypto';
import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { neutraliseText, restoreText } from '../../src/io/escape';
import type { Cell, Column, Report, ReportTable } from '../../src/report/model';
import { reportTables, STYLE_DIGITS } from '../../src/report/model';
import { REPORT_CSS, writeCsv, writeHtml, writeJson, writeXlsx } from '../../src/report/index';
import { hostileReport, PAYLOADS, RISKY } from './fixture';

const ENTITIES: Record<string, string> = { '&amp;': '&', '&lt;': '<', '&gt;': '>', '&quot;': '"', '&#39;': "'" };
const unescape = (s: string) => s.replace(/&(amp|lt|gt|quot|#39);/g, (m) => ENTITIES[m]!);

/**
 * The one display rule, restated here from its description (src/report/charts/format.ts): a
 * column shows the fraction digits that give its largest absolute value four significant digits
 * (0 to 6), counts none, a column's own digits when it fixes them.
 */
function ruleDigits(c: Column, values: readonly Cell[]): number {
  if (c.digits !== undefined) return c.digits;
  if (c.style === 'count') return 0;
  const nums = values.filter((v): v is number => typeof v === 'number' && Number.isFinite(v) && v !== 0).map(Math.abs);
  if (!nums.length) return 0;
  // The largest, rounded to four significant digits (9.9996 counts as 10.00).
  const max = Number(Math.max(...nums).toPrecision(4));
  const whole = max >= 1 ? String(Math.floor(max)).length : Math.floor(Math.log10(max)) + 1;
  return Math.max(0, Math.min(6, 4 - whole));
}

function fmt(v: number, c: Column, locale: string): string {
  const d = c.digits ?? STYLE_DIGITS[c.style ?? 'amount'];
  return new Intl.NumberFormat(locale, { minimumFractionDigits: d, maximumFractionDigits: d }).format(Math.abs(v) < 0.5 * 10 ** -d ? 0 : v);
}

let report: Report;
let json: Report;
let html: string;
let csv: string;
let xlsx: Uint8Array;

beforeAll(async () => {
  report = hostileReport({ invented: true });
  json = JSON.parse(writeJson(report)) as Report;
  html = writeHtml(report);
  csv = writeCsv(report);
  xlsx = await writeXlsx(report);
});

/** Rows of cells of one HTML table: [kind, value] per cell, from the markup alone. */
function htmlTable(id: string): { body: { num: boolean; value: string; shown: string }[][]; foot: { num: boolean; value: string; shown: string }[][] } {
  const m = new RegExp(`<table data-table="${id.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}">([\\s\\S]*?)</table>`).exec(html);
  expect(m, `table ${id} in the HTML`).not.toBeNull();
  const part = (tag: string) => {
    const p = new RegExp(`<${tag}>([\\s\\S]*?)</${tag}>`).exec(m![1]!);
    if (!p) return [];
    return [...p[1]!.matchAll(/<tr>([\s\S]*?)<\/tr>/g)].map((r) =>
      [...r[1]!.matchAll(/<td([^>]*)>([^<]*)<\/td>/g)].map((c) => {
        const dv = /data-value="([^"]*)"/.exec(c[1]!);
        return { num: /class="num/.test(c[1]!), value: dv ? unescape(dv[1]!) : unescape(c[2]!), shown: unescape(c[2]!) };
      }),
    );
  };
  return { body: part('tbody'), foot: part('tfoot') };
}

function sameCell(got: { num: boolean; value: string; shown: string }, want: Cell, col: Column, where: string, locale: string) {
  if (col.type === 'number' && (typeof want === 'number' || want === null)) {
    expect(got.num, where).toBe(true);
    if (want === null) expect(got.value, where).toBe('');
    else {
      expect(Number(got.value), where).toBe(want);
      expect(got.shown, where).toBe(fmt(want, col, locale));
    }
  } else {
    expect(got.value, where).toBe(want === null ? '' : String(want));
  }
}

describe('HTML report', () => {
  it('every number cell of every table equals the JSON (data-value exact, text in the locale), blanks blank', () => {
    let cells = 0;
    for (const t0 of reportTables(json)) {
      const t = { ...t0, columns: t0.columns.map((c, j) => (c.type === 'number' ? { ...c, digits: ruleDigits(c, [...t0.rows.map((r) => r[j] ?? null), ...(t0.totals ? [t0.totals[j] ?? null] : [])]) } : c)) };
      const h = htmlTable(t.id);
      expect(h.body.length, t.id).toBe(t.rows.length);
      t.rows.forEach((r, i) => {
        expect(h.body[i]!.length, `${t.id} row ${i}`).toBe(t.columns.length);
        r.forEach((v, j) => {
          sameCell(h.body[i]![j]!, v, t.columns[j]!, `${t.id}[${i}][${j}]`, json.locale);
          cells++;
        });
      });
      if (t.totals) t.totals.forEach((v, j) => sameCell(h.foot[0]![j]!, v, t.columns[j]!, `${t.id} totals [${j}]`, json.locale));
    }
    expect(cells).toBeGreaterThan(1000);
  });

  it('has no script, no event handler, no inline style, no external reference, and only known tags', () => {
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/<img/i);
    expect(html).not.toMatch(/<iframe|<object|<embed|<link|<base|<form|<input/i);
    const tags = new Set([...html.matchAll(/<\/?([a-zA-Z][a-zA-Z0-9]*)/g)].map((m) => m[1]!.toLowerCase()));
    const allowed = new Set('html head meta title style body header nav ol li a section h1 h2 h3 p ul div table caption thead tbody tfoot tr th td span figure figcaption footer svg desc rect line text circle g path'.split(' '));
    for (const t of tags) expect(allowed.has(t), `tag <${t}>`).toBe(true);
    for (const m of html.matchAll(/<[a-zA-Z][^>]*>/g)) {
      expect(m[0], 'event handler').not.toMatch(/\son[a-z]+\s*=/i);
      expect(m[0], 'inline style').not.toMatch(/\sstyle\s*=/i);
      expect(m[0], 'src').not.toMatch(/\ssrc\s*=/i);
      const href = /\shref="([^"]*)"/.exec(m[0]);
      if (href) expect(href[1], 'only links within the page').toMatch(/^#/);
    }
    expect(html.match(/<style>/g)?.length).toBe(1);
    expect(REPORT_CSS).not.toMatch(/url\(|@import|https?:|\/\//);
    // No attribute points anywhere (text may mention a URL, escaped); the SVG namespace is a name, not a request.
    for (const m of html.matchAll(/\s([a-zA-Z:-]+)="([^"]*)"/g)) if (m[1] !== 'xmlns') expect(m[2], m[1]).not.toMatch(/https?:|\/\/|data:/i);
  });

  it('states a strict Content-Security-Policy whose style hash is that of its one <style> element (source: node:crypto)', () => {
    const csp = /<meta http-equiv="Content-Security-Policy" content="([^"]+)">/.exec(html)![1]!.replace(/&#39;/g, "'");
    const style = /<style>([\s\S]*?)<\/style>/.exec(html)![1]!;
    const hash = createHash('sha256').update(style, 'utf8').digest('base64');
    expect(csp).toContain(`style-src 'sha256-${hash}'`);
    expect(csp).toMatch(/default-src 'none'/);
    expect(csp).toMatch(/script-src 'none'/);
    expect(html.indexOf('Content-Security-Policy')).toBeLessThan(html.indexOf('<style>'));
    expect(style).toMatch(/@media print/);
    expect(style).toMatch(/@page/);
  });

  it('escapes every payload (they appear only in their escaped form)', () => {
    for (const p of PAYLOADS) {
      const esc = p.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
      expect(html, p).toContain(esc);
    }
    expect(html).toContain('&lt;script&gt;alert(&quot;report&quot;)&lt;/script&gt;');
  });

  it('states inputs with SHA-256, tool, date, settings, assumptions, cautions, units and the invented flag', () => {
    for (const f of json.inputs) expect(html).toContain(f.sha256);
    expect(html).toContain('0.1.0-test');
    expect(html).toMatch(/March 4, 2026/);
    expect(html).toContain('INVENTED DATA');
    for (const s of json.settings) expect(html).toContain(s.label.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;'));
    for (const re of [/fixed coefficients/i, /no capacity limits/i, /gross, not net/i, /not a forecast/i, /qualified economist/i, /local guidance/i]) {
      expect(json.cautions.some((c) => re.test(c)), String(re)).toBe(true);
      expect(html).toMatch(re);
    }
    expect(json.assumptions.length).toBeGreaterThan(2);
    for (const t of reportTables(json)) for (const c of t.columns) if (c.type === 'number') expect(c.unit, `${t.id}.${c.key} has a unit`).toBeTruthy();
    expect(html).toContain(json.table.moneyUnit);
  });

  it('shows Type I and II as blank with a note where the direct effect is 0, and never NaN', () => {
    const jobs = json.sections.find((s) => s.kind === 'multipliers')!.tables.find((t) => t.id === 'multipliers-JOBS')!;
    const k1 = jobs.columns.findIndex((c) => c.key === 'typeI');
    const k2 = jobs.columns.findIndex((c) => c.key === 'typeII');
    expect(jobs.rows[0]![k1]).toBeNull();
    expect(jobs.rows[0]![k2]).toBeNull();
    expect(typeof jobs.rows[1]![k1]).toBe('number');
    expect(jobs.notes.join(' ')).toMatch(/blank .*no direct employment/i);
    const h = htmlTable('multipliers-JOBS');
    expect(h.body[0]![k1]!.value).toBe('');
    for (const text of [html, csv, writeJson(report)]) expect(text).not.toMatch(/NaN|Infinity/);
  });

  it('formats numbers in the requested locale (source: Intl.NumberFormat, de-DE uses . for thousands and , for decimals)', () => {
    const de = writeHtml(hostileReport({ locale: 'de-DE' }));
    const t = reportTables(json).find((x) => x.id === 'extraction-ranking')!;
    const v = t.rows[0]![2] as number;
    const d = ruleDigits(t.columns[2]!, t.rows.map((r) => r[2] ?? null));
    expect(de).toContain(`>${new Intl.NumberFormat('de-DE', { minimumFractionDigits: d, maximumFractionDigits: d }).format(v)}<`);
    // 12345.678 in de-DE with one decimal (source: Intl.NumberFormat): "12.345,7".
    expect(new Intl.NumberFormat('de-DE', { minimumFractionDigits: 1, maximumFractionDigits: 1 }).format(12345.678)).toBe('12.345,7');
    expect(de).toMatch(/<html lang="de">/);
  });
});

/** Locate a table in rows of plain cells by its title, then its header; returns its data rows. */
function locate(rows: unknown[][], t: ReportTable, text: (v: unknown) => string): unknown[][] {
  const header = t.columns.map((c) => (c.type === 'number' && c.unit ? `${c.label} (${c.unit})` : c.label));
  for (let r = 0; r < rows.length; r++) {
    if (text(rows[r]![0]) !== t.title) continue;
    const h = r + 1 + (t.about ? 1 : 0);
    const got = header.map((_, j) => text(rows[h]?.[j]));
    if (got.every((g, j) => g === header[j])) return rows.slice(h + 1, h + 1 + t.rows.length + (t.totals ? 1 : 0));
  }
  throw new Error(`table '${t.id}' not found`);
}

function compareRows(found: unknown[][], t: ReportTable, read: (v: unknown) => number | string | null, where: string) {
  const all = t.totals ? [...t.rows, t.totals] : t.rows;
  all.forEach((r, i) =>
    r.forEach((want, j) => {
      const got = read(found[i]?.[j]);
      expect(got, `${where} ${t.id}[${i}][${j}]`).toStrictEqual(want);
    }),
  );
}

describe('XLSX report (read back with exceljs 4.4.0)', () => {
  let sheets: { name: string; rows: unknown[][]; cells: ExcelJS.Cell[] }[];
  beforeAll(async () => {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(Buffer.from(xlsx) as unknown as ArrayBuffer);
    sheets = wb.worksheets.map((ws) => {
      const rows: unknown[][] = [];
      const cells: ExcelJS.Cell[] = [];
      ws.eachRow({ includeEmpty: true }, (row, r) => {
        const out: unknown[] = [];
        row.eachCell({ includeEmpty: true }, (c, k) => {
          out[k - 1] = c.value;
          cells.push(c);
        });
        rows[r - 1] = out;
      });
      for (let r = 0; r < rows.length; r++) rows[r] ??= [];
      return { name: ws.name, rows, cells };
    });
  });

  it('has the summary, impacts, multipliers, inputs and notes sheets', () => {
    const names = sheets.map((s) => s.name);
    for (const n of ['Summary', 'Impacts', 'Multipliers', 'Linkages', 'Sensitivity', 'Inputs', 'Notes']) expect(names).toContain(n);
  });

  it('every number of every table equals the JSON, with a number format; blanks are empty cells', () => {
    // XML normalises a carriage return in text to a line feed when read (source: XML 1.0, section 2.11).
    const cr = (s: string) => s.replace(/\r/g, '\n');
    const text = (v: unknown) => (typeof v === 'string' ? cr(restoreText(v.replace(/^'\n/, "'\r"))) : v === null || v === undefined ? '' : String(v));
    const rows = sheets.flatMap((s) => s.rows.map((r) => r));
    for (const t0 of reportTables(json)) {
      const t = { ...t0, title: cr(t0.title), columns: t0.columns.map((c) => ({ ...c, label: cr(c.label) })), rows: t0.rows.map((r) => r.map((v) => (typeof v === 'string' ? cr(v) : v))), totals: t0.totals?.map((v) => (typeof v === 'string' ? cr(v) : v)) };
      if (!t.totals) delete t.totals;
      const found = locate(rows, t, text);
      // A text neutralised for its leading CR reads back as a quote and a line feed: restore it as the CR it was.
      compareRows(found, t, (v) => (v === undefined || v === null ? null : typeof v === 'number' ? v : cr(restoreText(String(v).replace(/^'\n/, "'\r")))), 'xlsx');
    }
    const numbers = sheets.flatMap((s) => s.cells).filter((c) => typeof c.value === 'number');
    expect(numbers.length).toBeGreaterThan(1000);
    expect(numbers.filter((c) => c.numFmt && /0/.test(c.numFmt)).length / numbers.length).toBeGreaterThan(0.95);
  });

  it('no formula cells; no text cell begins with = + - @ tab or CR; negative numbers are numbers', () => {
    let negatives = 0;
    for (const s of sheets) {
      for (const c of s.cells) {
        expect(c.type, `${s.name}!${c.address}`).not.toBe(ExcelJS.ValueType.Formula);
        if (typeof c.value === 'string') expect(RISKY.test(c.value), `${s.name}!${c.address}: ${JSON.stringify(c.value)}`).toBe(false);
        if (typeof c.value === 'number' && c.value < 0) negatives++;
      }
    }
    expect(negatives).toBeGreaterThan(20);
    const texts = sheets.flatMap((s) => s.cells).filter((c) => typeof c.value === 'string').map((c) => c.value as string);
    for (const p of PAYLOADS) if (RISKY.test(p)) expect(texts.some((x) => x.startsWith(neutraliseText(p).replace(/\r/g, '\n'))), p).toBe(true);
  });
});

describe('CSV report (read back with papaparse 5.7.1)', () => {
  let rows: string[][];
  beforeAll(() => {
    rows = Papa.parse<string[]>(csv, { skipEmptyLines: false }).data;
  });

  it('every number of every table equals the JSON; text cells read back to the same text', () => {
    const text = (v: unknown) => restoreText(String(v ?? ''));
    for (const t of reportTables(json)) {
      const found = locate(rows, t, text);
      const cols = t.columns;
      const all = t.totals ? [...t.rows, t.totals] : t.rows;
      all.forEach((r, i) =>
        r.forEach((want, j) => {
          const raw = found[i]?.[j] as string | undefined;
          const got = raw === undefined || raw === '' ? null : typeof want === 'number' && cols[j]!.type === 'number' ? Number(raw) : restoreText(raw);
          expect(got, `csv ${t.id}[${i}][${j}]`).toStrictEqual(typeof want === 'number' && cols[j]!.type !== 'number' ? String(want) : want);
        }),
      );
    }
  });

  it('no text field begins with = + - @ tab or CR; negative numbers stay numbers', () => {
    let negatives = 0;
    for (const r of rows) {
      for (const f of r) {
        if (!RISKY.test(f)) continue;
        // The only fields that may begin with '-' are numbers.
        expect(f, JSON.stringify(f)).toMatch(/^-\d+(\.\d+)?(e[-+]?\d+)?$/);
        expect(Number.isFinite(Number(f))).toBe(true);
        negatives++;
      }
    }
    expect(negatives).toBeGreaterThan(20);
    for (const p of PAYLOADS) if (RISKY.test(p)) expect(csv, p).toContain(neutraliseText(`${p} sector`).replace(/"/g, '""'));
  });
});
