/**
 * Markup of part B's panels, rendered to HTML in Node (svelte/server): the Open panel's one
 * picker and its labels, the Checks panel's findings as buttons with their file cell, the Report
 * panel's four downloads beside the cautions, and the layout step's adjustable guesses. The
 * findings are those src/io and the engine give for the demo CSV with one flow changed (invented
 * numbers: only their places and messages matter here).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { render } from 'svelte/server';
import { checks, toPlain } from '../../engine/index';
import { readTableFile } from '../../src/io/index';
import type { LayoutMapping } from '../../src/io/index';
import OpenPanel from '../../web/panels/OpenPanel.svelte';
import ChecksPanel from '../../web/panels/ChecksPanel.svelte';
import ReportPanel from '../../web/panels/ReportPanel.svelte';
import LayoutPanel from '../../web/panels/LayoutPanel.svelte';
import { app, layout, sourceSheet } from '../../web/lib/state.svelte';
import { REPO } from '../e2e/helpers';

async function edited() {
  const lines = readFileSync(join(REPO, 'data-demo/vellan-coast.csv'), 'utf8').split('\n');
  const at = lines.findIndex((l) => l.startsWith('FISH,'));
  const c = lines[at]!.split(',');
  c[5] = String(Number(c[5]) + 40);
  lines[at] = c.join(',');
  return readTableFile(new TextEncoder().encode(lines.join('\n')), { file: 'edited.csv' });
}

describe('part B panels', () => {
  it('the Open panel has one file picker for every kind of file, labelled, and the demo button', () => {
    const { body } = render(OpenPanel);
    expect((body.match(/<input type="file"/g) ?? []).length).toBe(1);
    expect(body).toMatch(/<input type="file" multiple(="")? accept="\.json,\.csv,\.tsv,\.txt,\.xlsx"/);
    expect(body).toMatch(/<label class="button[^"]*">\s*Choose a file…/);
    expect(body).toContain('supply-use tables');
    expect(body).toContain('Open the demo economy');
  });

  it('the Checks panel lists reader and engine findings, errors first, each a button naming its cell of the file', async () => {
    const r = await edited();
    app.table = toPlain(r.table);
    app.tableName = 'edited.csv';
    app.readFindings = r.findings;
    app.findings = checks(r.table);
    sourceSheet.mapping = r.mapping as LayoutMapping;
    const { body } = render(ChecksPanel);
    const n = r.findings.length + app.findings.length;
    expect((body.match(/<button type="button" class="finding[ "]/g) ?? []).length).toBe(n);
    expect(body).toMatch(/2 warnings?|3 warnings/);
    const cell = r.findings.find((f) => f.code === 'total-mismatch')!.where!.cell!;
    expect((body.match(new RegExp(`file edited\\.csv, cell ${cell}`, 'g')) ?? []).length).toBeGreaterThanOrEqual(3);
    expect(body).toContain('aria-pressed="false"');
  });

  it('the Report panel offers the four formats beside the cautions', () => {
    const { body } = render(ReportPanel);
    for (const f of ['HTML', 'XLSX', 'CSV', 'JSON']) expect(body).toContain(`Download ${f}`);
    expect(body).toMatch(/aria-label="Cautions"/);
    expect(body).toMatch(/not a forecast/);
  });

  it('the layout step shows every guess as a labelled control, the roles by code, and the mapping as JSON', async () => {
    const r = await edited();
    layout.mode = 'table';
    layout.sheets = [
      {
        info: { type: 'sheet', id: 'f1', name: 'edited.csv', sha256: 'a'.repeat(64), size: 1, kind: 'csv', conventions: { delimiter: ',', decimal: '.' }, options: {}, rowCount: 36, colCount: 26, shape: 'wide', findings: [] },
        mapping: r.mapping as LayoutMapping,
        problem: null,
        findings: r.findings,
        given: {},
      },
    ];
    layout.active = 0;
    const { body } = render(LayoutPanel);
    for (const l of ['Delimiter', 'Decimal mark', 'Thousands separator', 'Shape', 'Code column', 'Label column', 'Code row', 'Label row', 'Title rows', 'Header rows', 'Note rows', 'Total output from', 'Empty cells'])
      expect(body, l).toContain(l);
    expect(body).toMatch(/aria-label="Role of row FOOD"/);
    expect(body).toMatch(/aria-label="Role of column HHC"/);
    expect(body).toContain('"format": "ripplewise-layout"');
    expect(body).toContain('Read the table');
    expect(body).toMatch(/Supply-use tables \(make and use\)/);
  });
});
