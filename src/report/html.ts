/**
 * The report as one self-contained HTML document: inline SVG charts, no script, no external
 * request of any kind, and a strict Content-Security-Policy in a meta tag (`default-src 'none'`,
 * styles only from the one <style> element, allowed by its SHA-256 hash). A print stylesheet
 * makes printing to PDF give a clean document.
 *
 * Every text from the data (labels, codes, names, notes) is escaped. Every number cell carries
 * its full value in `data-value` (the shortest text that reads back as the same number), shown
 * rounded in the report's locale; a blank (null) has an empty `data-value`.
 */
import { groupedBars, linkageQuadrant, numberFormat, percentileBands, stackedBars, tornado } from './charts';
import { EFFECT_COLOURS } from './charts/palette';
import { escapeXml } from './charts/svg';
import { cellFormatter, shownColumns, singleColumn } from './format';
import type { Cell, ChartSpec, Column, Headline, Report, ReportTable, Section } from './model';
import { failureLines } from './model';
import { sha256Base64 } from './sha256';

export const REPORT_CSS = `
:root { color-scheme: light; --ink: #1d1d1f; --muted: #5b5b61; --line: #d9d9de; --soft: #f4f4f6; --warn: #8a4b00; --warn-bg: #fff4e0; }
* { box-sizing: border-box; }
html { font-family: system-ui, -apple-system, "Segoe UI", sans-serif; color: var(--ink); background: #fff; line-height: 1.45; }
body { margin: 0 auto; padding: 24px 28px 48px; max-width: 1120px; }
h1 { font-size: 1.7rem; margin: 0.2rem 0 0.4rem; }
h2 { font-size: 1.3rem; margin: 2.2rem 0 0.6rem; padding-top: 0.6rem; border-top: 2px solid var(--line); }
h3 { font-size: 1.05rem; margin: 1.6rem 0 0.4rem; }
p { margin: 0.4rem 0; }
.meta, .about, .note, .unit { color: var(--muted); }
.about { font-style: italic; }
.failed { background: #fdecea; color: #8a1c12; border: 3px solid #8a1c12; padding: 8px 12px; margin: 0 0 12px; }
.failed p:first-child { font-weight: 700; }
.invented { background: var(--warn-bg); color: var(--warn); border: 2px solid var(--warn); padding: 8px 12px; font-weight: 700; letter-spacing: 0.02em; }
.cautions { background: var(--soft); border-left: 4px solid var(--warn); padding: 4px 16px 8px; margin-top: 1rem; }
.cautions h2 { border: 0; margin-top: 0.6rem; }
nav ol { columns: 2; padding-left: 1.2rem; }
nav a { color: inherit; }
.scroll { overflow-x: auto; max-width: 100%; }
table { border-collapse: collapse; margin: 0.4rem 0 0.6rem; font-size: 0.86rem; }
caption { position: absolute; width: 1px; height: 1px; overflow: hidden; clip-path: inset(50%); white-space: nowrap; }
th, td { border-bottom: 1px solid var(--line); padding: 3px 8px; vertical-align: top; }
th { text-align: left; background: var(--soft); font-weight: 600; }
th .unit { display: block; font-weight: 400; font-size: 0.78rem; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
tfoot td { font-weight: 600; border-top: 2px solid var(--ink); }
td.code { font-family: ui-monospace, "SFMono-Regular", Menlo, monospace; font-size: 0.8rem; }
td.hash { font-family: ui-monospace, "SFMono-Regular", Menlo, monospace; font-size: 0.74rem; word-break: break-all; }
ul.notes { margin: 0.2rem 0 0.8rem; padding-left: 1.2rem; color: var(--muted); font-size: 0.85rem; }
figure { margin: 0.8rem 0; }
figure svg { max-width: 100%; height: auto; }
figcaption { color: var(--muted); font-size: 0.85rem; }
.severity-error { color: #a40000; font-weight: 700; }
.severity-warning { color: var(--warn); font-weight: 600; }
footer { margin-top: 3rem; color: var(--muted); font-size: 0.85rem; border-top: 1px solid var(--line); padding-top: 0.6rem; }
@media print {
  @page { size: A4; margin: 14mm 12mm; }
  html { font-size: 9.5pt; }
  body { max-width: none; padding: 0; }
  nav { display: none; }
  h2 { break-before: page; border-top: 0; }
  .cautions h2, #summary h2 { break-before: auto; }
  h2, h3, caption { break-after: avoid; }
  tr, figure { break-inside: avoid; }
  thead { display: table-header-group; }
  .scroll { overflow: visible; }
  table { font-size: 7.5pt; }
  th { background: none; border-bottom: 1.5px solid #000; }
  .invented { border-width: 1.5px; }
  a { color: inherit; text-decoration: none; }
}
`.trim();

/** The Content-Security-Policy of every report: nothing may load; only the report's own style applies. */
export function reportCsp(css: string = REPORT_CSS): string {
  return `default-src 'none'; style-src 'sha256-${sha256Base64(css)}'; img-src 'none'; font-src 'none'; connect-src 'none'; script-src 'none'; object-src 'none'; frame-src 'none'; base-uri 'none'; form-action 'none'`;
}

export interface HtmlOptions {
  /** The locale of the numbers shown (default: the report's). */
  locale?: string;
}

const e = escapeXml;

/** The whole report as an HTML document (a string). */
export function writeHtml(report: Report, options: HtmlOptions = {}): string {
  const locale = options.locale ?? report.locale;
  const fmt = cellFormatter(locale);
  const chartFormat = numberFormat(locale);
  const out: string[] = [];
  out.push('<!doctype html>');
  out.push(`<html lang="${e(langOf(locale))}">`);
  out.push('<head>');
  out.push('<meta charset="utf-8">');
  out.push(`<meta http-equiv="Content-Security-Policy" content="${e(reportCsp())}">`);
  out.push('<meta name="viewport" content="width=device-width, initial-scale=1">');
  out.push(`<meta name="generator" content="${e(`${report.tool.name} ${report.tool.version}`)}">`);
  out.push('<meta name="referrer" content="no-referrer">');
  out.push(`<title>${e(report.title)}</title>`);
  out.push(`<style>${REPORT_CSS}</style>`);
  out.push('</head>');
  out.push('<body>');
  out.push('<header>');
  if (report.failed) {
    const [head, ...rest] = failureLines(report);
    out.push(`<div class="failed" role="alert"><p>${e(head!)}</p>${rest.map((l) => `<p>${e(l)}</p>`).join('')}</div>`);
  }
  if (report.invented) out.push('<p class="invented" role="note">INVENTED DATA: every number in this report comes from an invented table. Do not use it for any decision.</p>');
  out.push(`<h1>${e(report.title)}</h1>`);
  if (report.subtitle) out.push(`<p class="meta">${e(report.subtitle)}</p>`);
  out.push(
    `<p class="meta">Made ${e(dateText(report.createdAt, locale))} with ${e(report.tool.name)} ${e(report.tool.version)}. Table: ${e(report.table.title)}. Money in ${e(report.table.moneyUnit)}${report.table.priceBasis ? `, ${e(report.table.priceBasis)}` : ''}.</p>`,
  );
  out.push('</header>');
  // Contents.
  const toc: [string, string][] = [['cautions', 'Read this first'], ['summary', 'Summary'], ...report.sections.map((s): [string, string] => [s.id, s.title]), ['inputs', 'Inputs and settings'], ['notes', 'Assumptions, findings and notes']];
  out.push('<nav aria-label="Contents"><ol>');
  for (const [id, title] of toc) out.push(`<li><a href="#${e(id)}">${e(title)}</a></li>`);
  out.push('</ol></nav>');
  // Cautions.
  out.push('<section id="cautions" class="cautions"><h2>Read this first</h2><ul>');
  for (const c of report.cautions) out.push(`<li>${e(c)}</li>`);
  out.push('</ul></section>');
  // Summary.
  out.push('<section id="summary"><h2>Summary</h2>');
  out.push(`<p>${e(tableSentence(report))}</p>`);
  if (report.headlines.length) out.push(headlineTable(report.headlines, fmt));
  out.push('</section>');
  for (const s of report.sections) out.push(sectionHtml(s, fmt, chartFormat));
  out.push(inputsHtml(report));
  out.push(notesHtml(report));
  out.push(`<footer><p>${e(report.tool.name)} ${e(report.tool.version)} · ${e(report.format)} version ${report.version} · ${e(report.createdAt)}${report.invented ? ' · INVENTED DATA' : ''}</p></footer>`);
  out.push('</body>');
  out.push('</html>');
  return out.join('\n') + '\n';
}

function langOf(locale: string): string {
  try {
    return new Intl.Locale(locale).language || 'en';
  } catch {
    return 'en';
  }
}

function dateText(iso: string, locale: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  try {
    return `${new Intl.DateTimeFormat(locale, { dateStyle: 'long', timeStyle: 'short', timeZone: 'UTC' }).format(d)} UTC`;
  } catch {
    return iso;
  }
}

function tableSentence(r: Report): string {
  const t = r.table;
  const parts = [`${t.title}: ${t.sectors} sectors`];
  if (t.region) parts.push(t.region);
  if (t.year !== undefined) parts.push(String(t.year));
  parts.push(`money in ${t.moneyUnit}`);
  if (t.priceBasis) parts.push(t.priceBasis);
  return `${parts.join(', ')}.${t.source ? ` Source: ${t.source}` : ''}`;
}

function headlineTable(h: readonly Headline[], fmt: (v: number | null, c: Column) => string): string {
  const rows = h
    .map((x) => {
      const col = singleColumn(x.style, x.value);
      return `<tr><td>${e(x.label)}</td>${numCell(x.value, col, fmt)}<td>${e(x.unit)}</td>${x.note ? `<td class="note">${e(x.note)}</td>` : ''}</tr>`;
    })
    .join('\n');
  return `<div class="scroll"><table class="headlines"><thead><tr><th>Result</th><th class="num">Value</th><th>Unit</th></tr></thead><tbody>\n${rows}\n</tbody></table></div>`;
}

function numCell(v: number | null, c: Column, fmt: (v: number | null, c: Column) => string): string {
  if (v === null) return '<td class="num blank" data-value=""></td>';
  return `<td class="num" data-value="${e(String(v))}">${e(fmt(v, c))}</td>`;
}

function cellHtml(v: Cell, c: Column, fmt: (v: number | null, c: Column) => string): string {
  if (c.type === 'number') {
    if (typeof v === 'number' || v === null) return numCell(v, c, fmt);
    return `<td class="num">${e(v)}</td>`;
  }
  if (v === null) return '<td></td>';
  return `<td${c.key === 'code' ? ' class="code"' : ''}>${e(typeof v === 'number' ? String(v) : v)}</td>`;
}

/** One table of the model as HTML, with its units in the header and its notes below. */
export function tableHtml(t: ReportTable, fmt: (v: number | null, c: Column) => string): string {
  const head = t.columns.map((c) => `<th${c.type === 'number' ? ' class="num"' : ''} scope="col">${e(c.label)}${c.type === 'number' && c.unit ? `<span class="unit">${e(c.unit)}</span>` : ''}</th>`).join('');
  const cols = shownColumns(t);
  const body = t.rows.map((r) => `<tr>${r.map((v, i) => cellHtml(v, cols[i]!, fmt)).join('')}</tr>`).join('\n');
  const foot = t.totals ? `<tfoot><tr>${t.totals.map((v, i) => cellHtml(v, cols[i]!, fmt)).join('')}</tr></tfoot>` : '';
  const notes = t.notes.length ? `<ul class="notes">${t.notes.map((n) => `<li>${e(n)}</li>`).join('')}</ul>` : '';
  const about = t.about ? `<p class="about">${e(t.about)}</p>` : '';
  return `<div class="scroll" id="${e(`t-${t.id}`)}">${about}<table data-table="${e(t.id)}"><caption>${e(t.title)}</caption><thead><tr>${head}</tr></thead><tbody>\n${body}\n</tbody>${foot}</table></div>${notes}`;
}

function chartHtml(c: ChartSpec, format: (v: number) => string): string {
  let svg: string;
  let caption: string;
  switch (c.kind) {
    case 'impact-by-sector':
      svg = stackedBars({
        title: c.title,
        unit: c.unit,
        categories: c.categories,
        series: [
          { key: 'direct', label: 'Direct', values: c.direct, colour: EFFECT_COLOURS.direct },
          { key: 'indirect', label: 'Indirect', values: c.indirect, colour: EFFECT_COLOURS.indirect },
          { key: 'induced', label: 'Induced', values: c.induced, colour: EFFECT_COLOURS.induced },
        ],
        format,
      }).svg;
      caption = `${c.title}, in ${c.unit}: direct, indirect and induced effects stacked, largest first.`;
      break;
    case 'multipliers-by-sector':
      svg = groupedBars({
        title: c.title,
        unit: c.unit,
        categories: c.categories,
        series: c.series.map((s) => ({ label: s.label, values: s.values.map((v) => (v === null ? Number.NaN : v)) })),
        reference: c.reference,
        format,
      }).svg;
      caption = `${c.title}, in ${c.unit}.${c.reference !== undefined ? ` The dashed line marks ${c.reference}.` : ''}`;
      break;
    case 'linkage-quadrant':
      svg = linkageQuadrant({ title: c.title, codes: c.codes, labels: c.labels, backward: c.backward, forward: c.forward }).svg;
      caption = `${c.title}: indices normalised to a mean of 1; key sectors are above 1 on both.`;
      break;
    case 'percentile-bands':
      svg = percentileBands({ title: c.title, unit: c.unit, categories: c.categories, low: c.low, mid: c.mid, high: c.high, point: c.point, format }).svg;
      caption = `${c.title}, in ${c.unit}: each bar spans the 5th to the 95th percentile, with the median and the table's own value marked.`;
      break;
    case 'tornado':
      svg = tornado({ title: c.title, unit: c.unit, base: c.base, items: c.items, lowLabel: `Coefficient −${c.percent} %`, highLabel: `Coefficient +${c.percent} %`, format }).svg;
      caption = `${c.title}, in ${c.unit}: each bar moves one coefficient by ±${c.percent} %.`;
      break;
  }
  return `<figure id="${e(c.id)}">${svg}<figcaption>${e(caption)}</figcaption></figure>`;
}

function sectionHtml(s: Section, fmt: (v: number | null, c: Column) => string, chartFormat: (v: number) => string): string {
  const out: string[] = [`<section id="${e(s.id)}" data-kind="${e(s.kind)}">`, `<h2>${e(s.title)}</h2>`, `<p class="about">${e(s.about)}</p>`];
  for (const p of s.paragraphs) out.push(`<p>${e(p)}</p>`);
  for (const c of s.charts) out.push(chartHtml(c, chartFormat));
  for (const t of s.tables) out.push(`<h3>${e(t.title)}</h3>`, tableHtml(t, fmt));
  if (s.cautions.length) out.push(`<ul class="notes">${s.cautions.map((c) => `<li>${e(c)}</li>`).join('')}</ul>`);
  out.push('</section>');
  return out.join('\n');
}

function inputsHtml(r: Report): string {
  const out: string[] = ['<section id="inputs"><h2>Inputs and settings</h2>'];
  out.push('<h3>Input files</h3><div class="scroll"><table data-table="inputs"><thead><tr><th>Role</th><th>File</th><th>Sheet</th><th class="num">Bytes</th><th>SHA-256</th></tr></thead><tbody>');
  for (const f of r.inputs) {
    out.push(`<tr><td>${e(f.role)}</td><td>${e(f.name)}</td><td>${e(f.sheet ?? '')}</td><td class="num"${f.bytes !== undefined ? ` data-value="${f.bytes}"` : ''}>${f.bytes !== undefined ? e(String(f.bytes)) : ''}</td><td class="hash">${e(f.sha256)}</td></tr>`);
  }
  out.push('</tbody></table></div>');
  out.push('<h3>Settings</h3><div class="scroll"><table data-table="settings"><thead><tr><th>Setting</th><th>Value</th><th>Chosen by</th><th>Note</th></tr></thead><tbody>');
  for (const s of r.settings) {
    out.push(`<tr><td>${e(s.label)}</td><td>${e(s.value === null ? 'none' : String(s.value))}</td><td>${e(s.source === 'given' ? 'given' : s.source === 'guessed' ? 'guessed from labels' : 'default')}</td><td>${e(s.note ?? '')}</td></tr>`);
  }
  out.push('</tbody></table></div>');
  const t = r.table;
  out.push('<h3>The table</h3><div class="scroll"><table data-table="table"><tbody>');
  const rows: [string, string][] = [
    ['Title', t.title],
    ['Region', t.region ?? ''],
    ['Year', t.year !== undefined ? String(t.year) : ''],
    ['Money unit (currency and scale)', t.moneyUnit],
    ['Price basis', t.priceBasis ?? ''],
    ['Source', t.source ?? ''],
    ['Sectors', String(t.sectors)],
    ['Final-demand columns', t.finalDemand.map((x) => `${x.code} (${x.label})`).join(', ')],
    ['Value-added rows', t.valueAdded.map((x) => `${x.code} (${x.label})`).join(', ')],
    ['Satellites', t.satellites.map((x) => `${x.code} (${x.label}, ${x.unit})`).join(', ')],
    ['Imports row', t.hasImports ? 'yes' : 'no'],
    ['Invented data', t.invented ? 'yes: invented for demonstration' : 'no'],
  ];
  for (const [k, v] of rows) out.push(`<tr><th scope="row">${e(k)}</th><td>${e(v)}</td></tr>`);
  out.push('</tbody></table></div>');
  if (t.notes.length) out.push(`<ul class="notes">${t.notes.map((n) => `<li>${e(n)}</li>`).join('')}</ul>`);
  out.push('</section>');
  return out.join('\n');
}

function notesHtml(r: Report): string {
  const out: string[] = ['<section id="notes"><h2>Assumptions, findings and notes</h2>'];
  out.push('<h3>Assumptions</h3><ul>');
  for (const a of r.assumptions) out.push(`<li>${e(a)}</li>`);
  out.push('</ul>');
  out.push('<h3>Findings</h3>');
  if (!r.findings.length) out.push('<p>No findings.</p>');
  else {
    out.push('<ul>');
    for (const f of r.findings) out.push(`<li><span class="severity-${e(f.severity)}">${e(f.severity)}</span> ${e(f.code)}: ${e(f.message)}${f.where ? ` <span class="meta">(${e(f.where)})</span>` : ''}</li>`);
    out.push('</ul>');
  }
  if (r.notes.length) {
    out.push('<h3>Notes</h3><ul>');
    for (const n of r.notes) out.push(`<li>${e(n)}</li>`);
    out.push('</ul>');
  }
  out.push('</section>');
  return out.join('\n');
}
