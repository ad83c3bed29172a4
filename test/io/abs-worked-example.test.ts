/**
 * A published worked example read as it comes: Australian Bureau of Statistics, Information
 * Paper: Australian National Accounts: Introduction to Input-Output Multipliers, Cat. No. 5246.0
 * (1995), Tables 1, 3 and 5 as transcribed in ../shared/reference/abs-5246-worked-example/ (its
 * README names what a reader meets). Checked: the printed simple output and income multipliers
 * (4 decimals; the README's numpy derivation agrees within 8e-5), first-round and industrial
 * support effects, value added without commodity taxes, sales by final buyers and imports, and
 * with the employment file attached the printed employment multipliers in whole persons.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { LeontiefModel } from '../../engine/leontief';
import { jobsMeasure, labourIncomeMeasure, outputMeasure, valueAddedMeasure } from '../../engine/measures';
import { multipliersOf } from '../../engine/multipliers';
import { attachSatellites, readGrid, readSatellites, readTableFile } from '../../src/io';
import { REFERENCE_DIR } from '../helpers/reference';

const DIR = join(REFERENCE_DIR, 'abs-5246-worked-example');
const WHERE = 'published by the Australian Bureau of Statistics (abs.gov.au, Cat. No. 5246.0, 1995); set RIPPLEWISE_REFERENCE to a folder holding abs-5246-worked-example/';
const present = existsSync(join(DIR, 'flows-1989-90.csv'));
if (!present) {
  if (process.env.CI === 'true') throw new Error(`reference data missing under CI: ${DIR} (${WHERE})`);
  console.warn(`skipping the ABS worked example tests: ${DIR} not found; the data is ${WHERE}`);
}

const read = (f: string) => new Uint8Array(readFileSync(join(DIR, f)));

describe.skipIf(!present)('the ABS 5246.0 worked example as it comes', () => {
  it('matches the printed multipliers; value added is wages, GOS and indirect taxes only', async () => {
    const { table: t0, mapping } = await readTableFile(read('flows-1989-90.csv'), { file: 'flows-1989-90.csv' });
    const sat = readSatellites((await readGrid(read('employment-1989-90.csv'), { file: 'employment-1989-90.csv' })).grid, { sectors: t0.sectors });
    const t = attachSatellites(t0, sat);
    expect(t.satellites[0]!.unit).toBe('FTE');
    // Value added: WSS, GOS, ITX; commodity taxes, sales by final buyers, imports and duties are not.
    const va = t.valueAdded.codes.filter((_, a) => !t.valueAdded.classes || ['compensation', 'operating-surplus', 'production-taxes', 'value-added'].includes(t.valueAdded.classes[a]!));
    expect(va).toEqual(['WSS', 'GOS', 'ITX']);
    for (const code of ['CTX', 'SFB', 'CMI', 'DCM', 'CPI', 'DCP']) expect(mapping.rows.find((r) => r.code === code)!.why).toMatch(/not value added/);
    const model = LeontiefModel.fromTable(t);
    const out = multipliersOf(t.sectors, model, outputMeasure(t));
    const inc = multipliersOf(t.sectors, model, labourIncomeMeasure(t, 'WSS'));
    const gva = multipliersOf(t.sectors, model, valueAddedMeasure(t));
    const emp = multipliersOf(t.sectors, model, jobsMeasure(t, t.satellites[0]!.code));
    const lines = new TextDecoder().decode(read('published-multipliers.csv')).trim().split(/\r?\n/).slice(1);
    expect(lines.length).toBe(7);
    for (const line of lines) {
      const [code, , first, support, simple, incInit, incSimple, empInit, empSimple] = line.split(',');
      const j = t.sectors.codes.indexOf(code!);
      expect(j, code).toBeGreaterThanOrEqual(0);
      let colA = 0;
      for (let i = 0; i < 7; i++) colA += t.Z.data[i * 7 + j]! / t.x[j]!;
      expect(Math.abs(colA - Number(first)), `${code} first round`).toBeLessThan(8e-5);
      expect(Math.abs(out.simple[j]! - 1 - colA - Number(support)), `${code} industrial support`).toBeLessThan(8e-5);
      expect(Math.abs(out.simple[j]! - Number(simple)), `${code} output`).toBeLessThan(8e-5);
      expect(Math.abs(inc.direct[j]! - Number(incInit)), `${code} initial income`).toBeLessThan(8e-5);
      expect(Math.abs(inc.simple[j]! - Number(incSimple)), `${code} income`).toBeLessThan(8e-5);
      expect(Math.round(emp.direct[j]!), `${code} initial employment`).toBe(Number(empInit));
      expect(Math.round(emp.simple[j]!), `${code} employment`).toBe(Number(empSimple));
      // Value added per unit of output is below 1: imports and commodity taxes are left out.
      expect(gva.simple[j]!).toBeLessThan(0.95);
    }
  });
});
