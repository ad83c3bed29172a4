/**
 * Rule affix-codes (fixtures: test/helpers/affix-layouts.ts, rows `DOM_01` against columns
 * `D01`, rows `01d` against columns `01`, code and label in one cell `DOM_01: Agriculture`, a
 * domestic block `DOM_..` followed by an imported block `IMP_..` repeating the labels).
 *
 * Reason: tables that separate domestic and imported use, and inter-country tables, mark the
 * rows and the columns of one sector with different affixes. When few codes name both a row and a
 * column as they stand, the rule looks for one affix on the rows and one on the columns (a prefix
 * or a suffix, possibly none on one side) that, once removed, make the most codes agree, at least
 * three and more than twice as many as before. Codes written with their label in one cell are
 * taken apart first. The sectors take the common stem as their code. A second block of rows with
 * another affix over the same stems (the labels repeated) is imported use by product: its rows are
 * imports (summed into the imports row), not a second set of sectors; the block whose affix says
 * import (IMP, M) is the imported one, else the later block. Where both axes carry labels, most
 * matched stems must carry the same label on both (else they are two classifications).
 *
 * Cost: a few candidate affixes per axis (those shared by three codes or more, the ten most
 * shared), each pair compared over the codes once; the rule runs only when the exact codes match
 * poorly, so ordinary tables pay one set intersection.
 */
import type { Finding } from '../../../engine/findings';
import type { Block, Entry } from '../block';

interface Affix {
  side: 'prefix' | 'suffix';
  text: string;
}

const NONE: Affix = { side: 'prefix', text: '' };

function stemOf(code: string, a: Affix): string | undefined {
  if (!a.text) return code;
  if (code.length <= a.text.length) return undefined;
  if (a.side === 'prefix') return code.startsWith(a.text) ? code.slice(a.text.length) : undefined;
  return code.endsWith(a.text) ? code.slice(0, code.length - a.text.length) : undefined;
}

/** The affixes shared by three codes or more, most shared first (then the shorter), at most ten, and none. */
function candidates(codes: string[]): Affix[] {
  const count = new Map<string, number>();
  for (const c of codes) {
    for (let k = 1; k <= Math.min(8, c.length - 1); k++) {
      const p = `p${c.slice(0, k)}`;
      const s = `s${c.slice(c.length - k)}`;
      count.set(p, (count.get(p) ?? 0) + 1);
      count.set(s, (count.get(s) ?? 0) + 1);
    }
  }
  const list = [...count].filter(([, n]) => n >= 3).sort((a, b) => b[1] - a[1] || a[0].length - b[0].length || (a[0] < b[0] ? -1 : 1));
  return [NONE, ...list.slice(0, 10).map(([k]) => ({ side: k[0] === 'p' ? ('prefix' as const) : ('suffix' as const), text: k.slice(1) }))];
}

const IMPORT_AFFIX = /^(imp|imports?|imported|m)[_\-.\s]?$|[_\-.\s](imp|m)$/i;

function describe(a: Affix): string {
  return a.text ? `${a.side} '${a.text}'` : 'no affix';
}

export interface AffixResult {
  finding: Finding;
  /** The codes were taken from cells holding code and label together. */
  split: boolean;
}

/**
 * Apply the rule to a block's entries (in place). `cut` takes a cell holding code and label
 * apart (layout.ts's rule), or gives null. Returns the note, or undefined when the rule does not
 * apply.
 */
export function matchAffixes(block: Block, cut: (text: string) => { code: string; label: string } | null): AffixResult | undefined {
  const { rows, cols } = block;
  const colSet = new Set(cols.map((e) => e.code));
  let exact = 0;
  for (const e of rows) if (colSet.has(e.code)) exact++;
  if (exact >= 3 && exact * 2 >= Math.min(rows.length, cols.length)) return undefined;
  const parts = (list: Entry[]) => list.map((e) => (e.label === e.code ? cut(e.code) : null) ?? { code: e.code, label: e.label });
  const rp = parts(rows);
  const cp = parts(cols);
  const rCodes = rp.map((p) => p.code);
  const cCodes = cp.map((p) => p.code);
  const ra = candidates(rCodes);
  const ca = candidates(cCodes);
  let best: { r: Affix; c: Affix; n: number; len: number } | undefined;
  for (const c of ca) {
    const stems = new Set<string>();
    for (const code of cCodes) {
      const s = stemOf(code, c);
      if (s) stems.add(s);
    }
    for (const r of ra) {
      if (!r.text && !c.text) continue;
      const seen = new Set<string>();
      for (const code of rCodes) {
        const s = stemOf(code, r);
        if (s && stems.has(s)) seen.add(s);
      }
      const len = r.text.length + c.text.length;
      if (!best || seen.size > best.n || (seen.size === best.n && len < best.len)) best = { r, c, n: seen.size, len };
    }
  }
  if (!best || best.n < 3 || best.n <= 2 * exact) return undefined;
  const colStems = new Map<string, number>();
  cCodes.forEach((code, j) => {
    const s = stemOf(code, best.c);
    if (s !== undefined && !colStems.has(s)) colStems.set(s, j);
  });
  const rowStems = new Set<string>();
  rCodes.forEach((code) => {
    const s = stemOf(code, best.r);
    if (s !== undefined && colStems.has(s)) rowStems.add(s);
  });
  // Where rows and columns both carry labels, most matched stems must carry the same label on
  // both axes: products and industries numbered alike ('P01 Products of agriculture' against
  // 'I01 Agriculture') are two classifications, not one sector with two codes.
  let labelled = 0;
  let agree = 0;
  const norm = (t: string) => t.toLowerCase().replace(/\s+/g, ' ').trim();
  const colLabel = new Map<string, string>();
  cCodes.forEach((code, j) => {
    const st = stemOf(code, best.c);
    if (st !== undefined && colStems.get(st) === j && cp[j]!.label !== code) colLabel.set(st, norm(cp[j]!.label));
  });
  const seenStem = new Set<string>();
  rCodes.forEach((code, i) => {
    const st = stemOf(code, best.r);
    if (st === undefined || seenStem.has(st) || !colLabel.has(st) || rp[i]!.label === code) return;
    seenStem.add(st);
    labelled++;
    if (norm(rp[i]!.label) === colLabel.get(st)) agree++;
  });
  if (labelled >= 3 && agree * 2 < labelled) return undefined;
  // Another block of rows over the same stems under another affix: imported use by product.
  let other: Affix | undefined;
  let otherN = 0;
  for (const r of ra) {
    if (r.text === best.r.text && r.side === best.r.side) continue;
    if (!r.text) continue;
    let n = 0;
    for (const code of rCodes) {
      const s = stemOf(code, r);
      if (s !== undefined && rowStems.has(s) && code !== `${best.r.side === 'prefix' ? best.r.text : ''}${s}${best.r.side === 'suffix' ? best.r.text : ''}`) n++;
    }
    if (n >= 3 && n * 2 >= rowStems.size && n > otherN) {
      other = r;
      otherN = n;
    }
  }
  let domestic = best.r;
  if (other) {
    // Which block is domestic: the one whose affix does not say import; else the earlier block.
    const first = (a: Affix) => rCodes.findIndex((code) => stemOf(code, a) !== undefined && rowStems.has(stemOf(code, a)!));
    const saysImport = (a: Affix) => IMPORT_AFFIX.test(a.text);
    if (saysImport(domestic) && !saysImport(other)) [domestic, other] = [other, domestic];
    else if (saysImport(domestic) === saysImport(other) && first(other) < first(domestic)) [domestic, other] = [other, domestic];
  }
  const why = `rule affix-codes: once the ${describe(domestic)} is removed from the row codes and the ${describe(best.c)} from the column codes, ${rowStems.size} codes name both a row and a column (${exact} before)`;
  let split = false;
  const sample: string[] = [];
  cols.forEach((e, j) => {
    const s = stemOf(cCodes[j]!, best.c);
    if (s === undefined || !rowStems.has(s) || colStems.get(s) !== j) return;
    if (cp[j]!.code !== e.code) split = true;
    e.why = `code '${e.code}' in the sheet read as '${s}' (${why})`;
    e.label = cp[j]!.label;
    e.code = s;
  });
  const used = new Set<string>();
  rows.forEach((e, i) => {
    const code = rCodes[i]!;
    const sd = stemOf(code, domestic);
    if (sd !== undefined && rowStems.has(sd) && !used.has(sd)) {
      used.add(sd);
      if (code !== e.code) split = true;
      if (sample.length < 3) sample.push(`'${e.code}' → '${sd}'`);
      e.why = `code '${e.code}' in the sheet read as '${sd}' (${why})`;
      e.label = rp[i]!.label;
      e.code = sd;
      return;
    }
    const so = other ? stemOf(code, other) : undefined;
    if (so !== undefined && rowStems.has(so) && e.role === undefined) {
      if (code !== e.code) split = true;
      e.label = rp[i]!.label;
      e.code = code;
      e.role = 'imports';
      e.why = `imported use of product ${so}: a block of rows with the ${describe(other!)} over the same ${rowStems.size} products as the domestic rows (${describe(domestic)}), read as imports by product, not a second set of sectors (rule affix-codes)`;
    }
  });
  if (split) {
    // The other lines of the table (final demand, value added, totals) written the same way are
    // taken apart too, when their label starts with a capital or a digit and no code comes out twice.
    for (const [list, ps] of [
      [rows, rp],
      [cols, cp],
    ] as const) {
      const taken = new Set(list.map((e) => e.code));
      list.forEach((e, i) => {
        const p = ps[i]!;
        if (e.why || e.label !== e.code || p.code === e.code || !/^[\p{Lu}\p{N}]/u.test(p.label) || taken.has(p.code)) return;
        taken.add(p.code);
        e.code = p.code;
        e.label = p.label;
      });
    }
  }
  const imp = other ? `; ${otherN} rows with the ${describe(other)} are imported use by product, read as imports` : '';
  return {
    split,
    finding: {
      code: 'affix-codes',
      severity: 'note',
      message: `file ${block.file}${block.sheet ? `, sheet '${block.sheet}'` : ''}: row and column codes differ by an affix: ${why} (${sample.join(', ')}...)${imp}; give the codes in a mapping (rename) to read them otherwise`,
      where: { file: block.file },
    },
  };
}
