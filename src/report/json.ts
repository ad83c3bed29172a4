/**
 * The report as JSON: the model itself (format `ripplewise-report`, version 1). Blank numbers
 * are `null`; every other number is written in full.
 */
import type { Report } from './model';

export function writeJson(report: Report): string {
  return JSON.stringify(report, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2) + '\n';
}
