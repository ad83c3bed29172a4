/**
 * The impacts as one tidy table (one observation a line): `scenario, sector, measure, effect,
 * value, unit`, with `effect` one of direct, indirect, induced and total (and, for impacts split
 * into rounds, first-round and later-rounds after indirect), for every scenario,
 * sector and measure (no totals rows: they are sums of the lines). Written by src/io's
 * `cellsToCsv` (text cells neutralised against formulas, numbers in their shortest exact form,
 * never in a locale), so that a spreadsheet, R or pandas reads it as it is.
 *
 * The lines before the header begin with `#` and carry the title and the cautions (read with
 * `comment='#'` in pandas or `comment.char = '#'` in R); the sectioned report CSV
 * (`src/report/csv.ts`) stays as it was.
 */
import { cellsToCsv } from '../io/write';
import type { Cell } from '../io/grid';
import type { Axis } from '../../engine/table';
import type { MeasureImpact } from '../../engine/impact';

export const TIDY_COLUMNS = ['scenario', 'sector', 'measure', 'effect', 'value', 'unit'] as const;
export const TIDY_EFFECTS = ['direct', 'indirect', 'induced', 'total'] as const;

/** One scenario's impact: what `engine/impact` gives (sectors and measures). */
export interface TidyScenario {
  scenario: string;
  sectors: Pick<Axis, 'codes'>;
  measures: readonly (Pick<MeasureImpact, 'measure' | 'unit' | 'direct' | 'indirect' | 'induced' | 'total'> & Partial<Pick<MeasureImpact, 'firstRound' | 'laterRounds'>>)[];
}

/** A note line: `# ` and the text on one line. */
function noteLine(text: string): string {
  return `# ${text.replace(/[\r\n]+/g, ' ')}`;
}

/** The tidy rows (header first), for writers other than CSV. */
export function tidyRows(list: readonly TidyScenario[]): Cell[][] {
  const rows: Cell[][] = [[...TIDY_COLUMNS]];
  for (const s of list)
    for (const m of s.measures)
      s.sectors.codes.forEach((code, i) => {
        for (const e of TIDY_EFFECTS) {
          const v = m[e][i]!;
          rows.push([s.scenario, code, m.measure.code, e, Number.isFinite(v) ? (v === 0 ? 0 : v) : null, m.unit]);
          // With the rounds split, the indirect effect's two parts follow it (they add up to it).
          if (e === 'indirect' && m.firstRound && m.laterRounds)
            for (const [name, part] of [['first-round', m.firstRound], ['later-rounds', m.laterRounds]] as const) {
              const p = part[i]!;
              rows.push([s.scenario, code, m.measure.code, name, Number.isFinite(p) ? (p === 0 ? 0 : p) : null, m.unit]);
            }
        }
      });
  return rows;
}

/** The tidy CSV text: note lines (title, cautions), then the header and one line per scenario, sector, measure and effect. */
export function writeTidyCsv(list: readonly TidyScenario[], notes: { title?: string; cautions?: readonly string[] } = {}): string {
  const head: string[] = [];
  if (notes.title) head.push(noteLine(notes.title));
  head.push(noteLine('One line per scenario, sector, measure and effect; lines beginning with # are notes.'));
  for (const c of notes.cautions ?? []) head.push(noteLine(`Caution: ${c}`));
  return head.join('\n') + '\n' + cellsToCsv(tidyRows(list));
}
