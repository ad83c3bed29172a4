/**
 * "Keep only lines where": the selection of a long sheet (the mapping's `select`, such as
 * { "TIME_PERIOD": "2020" }) as the Layout step edits it, from the fields the worker offers
 * (`file-long-fields`). Plain functions, testable without a browser.
 */
import type { LongField, LongFieldText } from '../worker/ops/long-fields';

export interface Condition {
  /** The key in `select`: a header name or a 1-based field number. */
  key: string;
  value: string;
  /** The field it names, when the worker reported it. */
  field?: LongField;
}

/** The field a key of `select` names: a field number, or a header name in any case. */
export function fieldOfKey(key: string, fields: readonly LongField[]): LongField | undefined {
  const k = key.trim();
  if (/^\d+$/.test(k)) return fields.find((f) => f.field === Number(k));
  return fields.find((f) => f.name.toLowerCase() === k.toLowerCase());
}

/** The conditions of a selection, in its order. */
export function conditionsOf(select: Record<string, string> | undefined, fields: readonly LongField[]): Condition[] {
  return Object.entries(select ?? {}).map(([key, value]) => {
    const field = fieldOfKey(key, fields);
    return field ? { key, value, field } : { key, value };
  });
}

/** Whether a field is worth choosing a text of: it holds a few different texts. */
function choosable(f: LongField): boolean {
  return !f.more && f.values.length > 1;
}

/** The fields a condition can be put on: those holding a few different texts, and those already in the selection. */
export function offeredFields(fields: readonly LongField[], select: Record<string, string> | undefined): LongField[] {
  const used = new Set(conditionsOf(select, fields).map((c) => c.field?.field));
  return fields.filter((f) => choosable(f) || used.has(f.field));
}

/** A field's texts in reading order (numbers by value: 2019 before 2020), with the one chosen even when it was not seen. */
export function textsOf(field: LongField | undefined, chosen?: string): LongFieldText[] {
  const out = [...(field?.values ?? [])].sort((a, b) => a.text.localeCompare(b.text, 'en', { numeric: true }));
  if (chosen !== undefined && !out.some((v) => v.text === chosen)) out.push({ text: chosen, lines: 0 });
  return out;
}

/** How a text is shown in the list: with its lines; an empty cell said in words. */
export function textLabel(v: LongFieldText): string {
  const t = v.text === '' ? '(empty)' : v.text;
  return `${t} (${v.lines} line${v.lines === 1 ? '' : 's'})`;
}

/** Flags and notes vary from line to line without making a pair repeat (as src/io leaves them out of its message). */
const NOTE_FIELD = /^(obs_)?(flags?|status|notes?)$/i;

/** The selection with one more condition: the first offered field not yet used, keeping its last text (the latest year). */
export function addCondition(select: Record<string, string> | undefined, fields: readonly LongField[]): Record<string, string> | undefined {
  const used = new Set(conditionsOf(select, fields).map((c) => c.field?.field));
  const free = offeredFields(fields, select).filter((f) => !used.has(f.field));
  const f = free.find((x) => !NOTE_FIELD.test(x.name)) ?? free[0];
  if (!f) return undefined;
  return { ...(select ?? {}), [f.key]: textsOf(f).at(-1)!.text };
}

/** The selection with the condition on `key` put on another field (its last text) or given another text; order kept. */
export function changeCondition(select: Record<string, string>, key: string, change: { field?: LongField; value?: string }): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(select)) {
    if (k !== key) out[k] = v;
    else if (change.field) out[change.field.key] = change.value ?? textsOf(change.field).at(-1)?.text ?? '';
    else out[k] = change.value ?? v;
  }
  return out;
}

/** The selection without the condition on `key`; undefined when nothing is left. */
export function removeCondition(select: Record<string, string>, key: string): Record<string, string> | undefined {
  const { [key]: _gone, ...rest } = select;
  return Object.keys(rest).length ? rest : undefined;
}

/**
 * What to tell the user when a long sheet gives a (row, column) pair twice: the fields to choose
 * a text of under "Keep only lines where". The fields named in src/io's message come first; else
 * those the worker found holding a few different texts (flags and notes left out).
 */
export function duplicateGuidance(problem: { message: string; code?: string } | null | undefined, fields: readonly LongField[], select: Record<string, string> | undefined): string {
  if (!problem || (problem.code !== undefined ? problem.code !== 'duplicate-entry' : !/is given a second time/.test(problem.message))) return '';
  const used = new Set(conditionsOf(select, fields).map((c) => c.field?.field));
  const free = fields.filter((f) => choosable(f) && !used.has(f.field));
  const said = problem.message.slice(problem.message.indexOf('differ in'));
  const named = free.filter((f) => problem.message.includes('differ in') && said.includes(`${f.name} (`));
  const names = (named.length ? named : free.filter((f) => !NOTE_FIELD.test(f.name)).slice(0, 1)).map((f) => f.name);
  if (!names.length) return "Choose the lines to keep under 'Keep only lines where' below.";
  return `Choose one ${names.join(' and one ')} under 'Keep only lines where' below.`;
}
