/**
 * Prints the demo table's checks and output multipliers: the main job on the built-in demo
 * until the workbench and the full command line arrive. The demo economy is INVENTED.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { LeontiefModel, checks, makeTable, moneyUnit, sortFindings } from '../engine/index';

const here = dirname(fileURLToPath(import.meta.url));
const table = makeTable(JSON.parse(readFileSync(join(here, 'vellan-coast.table.json'), 'utf8')));
console.log(`${table.meta.title}\n${table.meta.source}\nMoney in ${moneyUnit(table.meta)}, ${table.meta.priceBasis}.\n`);
console.log('Checks');
for (const f of sortFindings(checks(table))) console.log(`  ${f.severity.padEnd(7)} ${f.code}: ${f.message}`);
const model = LeontiefModel.fromTable(table);
const om = model.outputMultipliers();
console.log('\nOutput multipliers (total output per unit of final demand, simple: direct + indirect)');
table.sectors.codes.forEach((c, j) => console.log(`  ${c.padEnd(5)} ${table.sectors.labels[j]!.padEnd(40)} ${om[j]!.toFixed(3)}`));
console.log('\nCautions: fixed coefficients, no capacity limits, gross not net effects, not a forecast; have a qualified economist review results and follow local guidance first.');
