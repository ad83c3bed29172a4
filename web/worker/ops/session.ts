/**
 * The worker's session: the current table and the models built from it (factored once, reused
 * by every question until the table changes). Only `setTable` replaces it.
 */
import { LeontiefModel, checks, makeTable } from '../../../engine/index';
import type { Finding, PlainTable, Table } from '../../../engine/index';

export interface Session {
  table: Table;
  findings: Finding[];
  /** Cached derived objects (models, measures...) keyed by what they depend on. */
  cache: Map<string, unknown>;
}

let session: Session | undefined;

export function setTable(plain: PlainTable): Session {
  const table = makeTable(plain);
  session = { table, findings: checks(table), cache: new Map() };
  return session;
}

export function current(): Session {
  if (!session) throw Object.assign(new Error('no table is open yet: open a file or the demo first'), { name: 'InputError', code: 'no-table' });
  return session;
}

/** A cached value of the current session, computed on first use. */
export function cached<T>(key: string, make: (s: Session) => T): T {
  const s = current();
  if (!s.cache.has(key)) s.cache.set(key, make(s));
  return s.cache.get(key) as T;
}

export function openModel(): LeontiefModel {
  return cached('open', (s) => LeontiefModel.fromTable(s.table));
}
