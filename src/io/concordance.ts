/**
 * Concordances (many-to-one mappings of sector codes onto groups) from a sheet (CSV or XLSX:
 * a code, its group, and optionally the group's label, with or without a header) or from JSON
 * (`{ "map": { "1110": "AGR" }, "labels": { "AGR": "Agriculture" } }`, a plain object of code to
 * group, a list of `{ from, to, label }`, or `{ "groups": { "AGR": ["1110", "1120"] } }`).
 *
 * A code given two different groups is an error naming both cells; the same pair twice is a note.
 */
import type { Concordance } from '../../engine/aggregate';
import { InputError } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import { EMPTY, type Grid, normalizeCode, normalizeLabel } from './grid';

export interface ConcordanceRead {
  concordance: Concordance;
  findings: Finding[];
}

const FROM = /^(from|source|code|codes|sector|sectors|detail|detailed|original|child|member)(\s*code)?$/i;
const TO = /^(to|target|group|groups|aggregate|aggregated|new|parent|into)(\s*code)?$/i;
const LABEL = /^(label|name|title|description|group\s*(label|name|title))$/i;

function build(pairs: { from: string; to: string; label?: string; at: string }[], file: string, labelsGiven?: Map<string, string>): ConcordanceRead {
  const findings: Finding[] = [];
  const seen = new Map<string, { to: string; at: string }>();
  const from: string[] = [];
  const to: string[] = [];
  const order: string[] = [];
  const labels = new Map<string, string>(labelsGiven ?? []);
  for (const p of pairs) {
    if (!p.from) throw new InputError('empty-code', `file ${file}, ${p.at}: the code is empty`, { file }, 'Give every line a code and a group');
    if (!p.to) throw new InputError('empty-code', `file ${file}, ${p.at}: code '${p.from}' has no group`, { file, sector: p.from }, 'Give every line a code and a group');
    const prev = seen.get(p.from);
    if (prev) {
      if (prev.to !== p.to) {
        throw new InputError('not-many-to-one', `file ${file}: code '${p.from}' is mapped to '${prev.to}' (${prev.at}) and to '${p.to}' (${p.at}); a concordance maps each code to one group`, { file, sector: p.from }, 'Keep one of the two lines');
      }
      findings.push({ code: 'concordance-repeat', severity: 'note', message: `file ${file}: code '${p.from}' → '${p.to}' is given twice (${prev.at} and ${p.at})`, where: { file, sector: p.from } });
      continue;
    }
    seen.set(p.from, { to: p.to, at: p.at });
    from.push(p.from);
    to.push(p.to);
    if (!order.includes(p.to)) order.push(p.to);
    if (p.label && !labels.has(p.to)) labels.set(p.to, p.label);
  }
  if (!from.length) throw new InputError('empty-file', `file ${file} has no lines of code and group`, { file }, 'Give a code and its group on each line');
  return { concordance: { from, to, groups: { codes: order, labels: order.map((g) => labels.get(g) ?? g) } }, findings };
}

/** Read a concordance from a sheet: a code, its group, and optionally the group's label. */
export function readConcordanceGrid(grid: Grid): ConcordanceRead {
  const file = grid.file;
  const rows: { r: number; cells: string[] }[] = [];
  for (let r = 0; r < grid.rowCount; r++) {
    if (grid.isEmptyRow(r)) continue;
    const row = grid.rows[r]!;
    const cells: string[] = [];
    for (let c = 0; c < row.kinds.length; c++) cells.push(row.kinds[c] === EMPTY ? '' : grid.text(r, c));
    rows.push({ r, cells });
  }
  if (!rows.length) throw new InputError('empty-file', `file ${file} is empty`, { file });
  let fromCol = 0;
  let toCol = 1;
  let labelCol: number | undefined;
  let start = 0;
  const head = rows[0]!.cells.map((t) => normalizeCode(t));
  const f = head.findIndex((t) => FROM.test(t));
  const t = head.findIndex((x) => TO.test(x));
  if (f >= 0 || t >= 0) {
    start = 1;
    if (f >= 0) fromCol = f;
    if (t >= 0) toCol = t;
    else toCol = f === 0 ? 1 : 0;
    const l = head.findIndex((x, i) => i !== fromCol && i !== toCol && LABEL.test(x));
    if (l >= 0) labelCol = l;
  } else if (rows.some((x) => (x.cells[2] ?? '').trim())) labelCol = 2;
  const widest = Math.max(...rows.map((x) => x.cells.length));
  if (widest < 2) throw new InputError('bad-concordance', `file ${file} has one column; a concordance needs a code and its group on each line`, { file }, 'Put the code in the first column and its group in the second');
  const pairs = rows.slice(start).map(({ r, cells }) => {
    const p: { from: string; to: string; label?: string; at: string } = {
      from: normalizeCode(cells[fromCol] ?? ''),
      to: normalizeCode(cells[toCol] ?? ''),
      at: `row ${r + 1}`,
    };
    if (labelCol !== undefined && cells[labelCol]) p.label = normalizeLabel(cells[labelCol]!);
    return p;
  });
  return build(pairs, file);
}

/** Read a concordance from JSON text. */
export function readConcordanceJson(text: string, file = 'concordance.json'): ConcordanceRead {
  let o: unknown;
  try {
    o = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch (e) {
    throw new InputError('bad-json', `file ${file} is not valid JSON: ${(e as Error).message}`, { file });
  }
  const bad = (what: string): never => {
    throw new InputError('bad-concordance', `file ${file}: ${what}`, { file }, 'Write { "map": { "code": "group" }, "labels": { "group": "label" } }, or a list of { "from", "to", "label" }');
  };
  const str = (v: unknown, what: string): string => {
    if (typeof v !== 'string' && typeof v !== 'number') bad(`${what} must be a text`);
    return normalizeCode(String(v));
  };
  let labels: Map<string, string> | undefined;
  const labelsOf = (v: unknown) => {
    if (v === undefined) return;
    if (typeof v !== 'object' || v === null || Array.isArray(v)) bad('labels must be an object of group to label');
    labels = new Map(Object.entries(v as Record<string, unknown>).map(([k, l]) => [normalizeCode(k), typeof l === 'string' ? l : bad(`the label of '${k}' must be a text`)]));
  };
  if (Array.isArray(o)) {
    return build(
      o.map((e, i) => {
        if (Array.isArray(e)) return { from: str(e[0], `entry ${i + 1}`), to: str(e[1], `entry ${i + 1}`), at: `entry ${i + 1}` };
        if (typeof e !== 'object' || e === null) bad(`entry ${i + 1} must be an object with from and to`);
        const x = e as Record<string, unknown>;
        const p: { from: string; to: string; label?: string; at: string } = { from: str(x.from, `entry ${i + 1}: from`), to: str(x.to, `entry ${i + 1}: to`), at: `entry ${i + 1}` };
        if (typeof x.label === 'string') p.label = x.label;
        return p;
      }),
      file,
    );
  }
  if (typeof o !== 'object' || o === null) bad('a concordance must be an object or a list');
  const x = o as Record<string, unknown>;
  if (x.groups !== undefined && !Array.isArray(x.groups)) {
    if (typeof x.groups !== 'object' || x.groups === null) bad('groups must be an object of group to a list of codes');
    labelsOf(x.labels);
    const pairs: { from: string; to: string; at: string }[] = [];
    for (const [g, members] of Object.entries(x.groups as Record<string, unknown>)) {
      if (!Array.isArray(members)) bad(`group '${g}' must list its codes`);
      for (const m of members as unknown[]) pairs.push({ from: str(m, `a member of '${g}'`), to: normalizeCode(g), at: `group '${g}'` });
    }
    return build(pairs, file, labels);
  }
  const map = (x.map ?? x) as Record<string, unknown>;
  if (typeof map !== 'object' || map === null || Array.isArray(map)) bad('map must be an object of code to group');
  if (x.map !== undefined) labelsOf(x.labels);
  const pairs = Object.entries(map)
    .filter(([k]) => x.map !== undefined || (k !== 'labels' && k !== 'format' && k !== 'version'))
    .map(([k, v]) => ({ from: normalizeCode(k), to: str(v, `the group of '${k}'`), at: `key '${k}'` }));
  return build(pairs, file, labels);
}
