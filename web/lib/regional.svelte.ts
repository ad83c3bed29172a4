/**
 * The Regionalise step's and the Balance tool's last runs, kept on the page for the report: the
 * requests (the worker computes again from them, so a restarted worker loses nothing) and the
 * tables they were made on or produced, so that the report carries a section only while one of
 * those tables is the current one. Not kept in the autosave or the project file.
 */
import type { PlainTable } from '../../engine/index';
import type { BalanceRequest, RegionalRequest } from '../worker/ops/regional';

export const regionalRuns = $state({
  regional: null as null | { request: RegionalRequest; tables: PlainTable[] },
  balance: null as null | { request: BalanceRequest; tables: PlainTable[] },
});

/** The requests to send with a report for the current table (a run made on it or producing it). */
export function reportRequests(current: PlainTable | null): { regional?: RegionalRequest; balance?: BalanceRequest } {
  const out: { regional?: RegionalRequest; balance?: BalanceRequest } = {};
  if (!current) return out;
  const r = regionalRuns.regional;
  if (r && r.tables.includes(current)) out.regional = $state.snapshot(r.request) as RegionalRequest;
  const b = regionalRuns.balance;
  if (b && b.tables.includes(current)) out.balance = $state.snapshot(b.request) as BalanceRequest;
  return out;
}
