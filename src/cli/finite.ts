/**
 * Results are finite or flagged. Two guards: `rangeFindings` holds the table's sums to the range
 * in which the model's products and sums stay finite (an error finding naming the sector and the
 * measure, before any work), and `checkFinite` walks a command's machine-readable result for an
 * infinity that got through anyway (an error naming the measure, the sector and the field),
 * so that an overflow never prints as a blank, `null` or "Infinity" with exit 0. NaN is left to
 * the commands, which use it for results that do not exist (a Type I multiplier where the direct
 * effect is zero) and show it as a blank with a note.
 */
import type { Finding } from '../../engine/findings';
import type { Table } from '../../engine/table';

/** The largest sum of magnitudes accepted in one line of the table (common practice: far below 1.8e308, so that multipliers times amounts stay finite). */
export const RANGE_LIMIT = 1e250;

/** Error findings for lines of the table whose sums of magnitudes reach past RANGE_LIMIT. */
export function rangeFindings(t: Table): Finding[] {
  const n = t.sectors.codes.length;
  const out: Finding[] = [];
  const flag = (sector: number, measure: string, sum: number) => {
    if (out.length >= 20) return;
    const code = t.sectors.codes[sector]!;
    out.push({
      code: 'beyond-range',
      severity: 'error',
      message: `sector '${code}' (${t.sectors.labels[sector] ?? code}), ${measure}: the amounts reach ${Number.isFinite(sum) ? sum.toExponential(2) : 'past the largest number'}, beyond ${RANGE_LIMIT.toExponential(0)}, where the model's products would overflow to infinity`,
      where: { sector: code },
    });
  };
  const { Z, F, V } = t;
  for (let i = 0; i < n; i++) {
    let s = Math.abs(t.x[i]!);
    for (let j = 0; j < Z.cols; j++) s += Math.abs(Z.data[i * Z.cols + j]!);
    for (let j = 0; j < F.cols; j++) s += Math.abs(F.data[i * F.cols + j]!);
    if (!(s <= RANGE_LIMIT)) flag(i, 'output (its row of flows, final demand and total output)', s);
  }
  for (let j = 0; j < n; j++) {
    let s = Math.abs(t.imports?.[j] ?? 0);
    for (let i = 0; i < Z.rows; i++) s += Math.abs(Z.data[i * Z.cols + j]!);
    for (let i = 0; i < V.rows; i++) s += Math.abs(V.data[i * V.cols + j]!);
    if (!(s <= RANGE_LIMIT)) flag(j, 'inputs (its column of flows, imports and value added)', s);
  }
  for (const sat of t.satellites) {
    for (let j = 0; j < n; j++) if (!(Math.abs(sat.values[j]!) <= RANGE_LIMIT)) flag(j, `${sat.label || sat.code} (${sat.unit})`, Math.abs(sat.values[j]!));
  }
  return out;
}

/** An infinity in a result: what it is and where. */
export interface NonFinite {
  path: string;
  measure?: string;
  sector?: string;
  scenario?: string;
  field: string;
  value: number;
}

/** The first infinities (up to `max`) in a machine-readable result, with the measure, sector and scenario around each. */
export function findInfinite(v: unknown, max = 5): NonFinite[] {
  const out: NonFinite[] = [];
  const ctx: { measure?: string; sector?: string; scenario?: string } = {};
  const walk = (x: unknown, path: string, field: string) => {
    if (out.length >= max) return;
    if (typeof x === 'number') {
      if (x === Infinity || x === -Infinity) out.push({ path, field, value: x, ...ctx });
      return;
    }
    if (ArrayBuffer.isView(x) && !(x instanceof DataView)) {
      const a = x as unknown as ArrayLike<number>;
      for (let i = 0; i < a.length && out.length < max; i++) if (a[i] === Infinity || a[i] === -Infinity) out.push({ path: `${path}[${i}]`, field, value: a[i]!, ...ctx });
      return;
    }
    if (!x || typeof x !== 'object') return;
    if (Array.isArray(x)) {
      x.forEach((y, i) => walk(y, `${path}[${i}]`, field));
      return;
    }
    const o = x as Record<string, unknown>;
    const saved = { ...ctx };
    // A measure has a unit; a scenario has demand changes or a name; a sector is what is left with a code.
    if (typeof o.code === 'string') {
      if ('unit' in o || 'kind' in o) ctx.measure = o.code;
      else ctx.sector = o.code;
    }
    if (typeof o.name === 'string' && ('changes' in o || 'impacts' in o || 'totals' in o)) ctx.scenario = o.name;
    for (const [k, y] of Object.entries(o)) walk(y, path ? `${path}.${k}` : k, k);
    Object.assign(ctx, saved);
    for (const k of Object.keys(ctx) as (keyof typeof ctx)[]) if (!(k in saved)) delete ctx[k];
  };
  walk(v, '', '');
  return out;
}

/** Error findings for the infinities of a result (none when it is finite). */
export function infiniteFindings(result: unknown): Finding[] {
  return findInfinite(result).map((f) => ({
    code: 'non-finite-result',
    severity: 'error',
    message: `${[f.scenario && `scenario '${f.scenario}'`, f.measure && `measure '${f.measure}'`, f.sector && `sector '${f.sector}'`].filter(Boolean).join(', ') || 'the result'}: ${f.field} is ${f.value > 0 ? '' : 'minus '}infinity (at ${f.path}); the amounts overflow the range of numbers`,
    ...(f.sector ? { where: { sector: f.sector } } : {}),
  }));
}
