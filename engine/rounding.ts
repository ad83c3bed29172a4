/**
 * How far a sum of `parts` figures rounded to `unit`, compared with its own rounded total, may
 * miss by rounding alone: the worst case (parts + 1)/2 units, capped at six standard deviations
 * of the parts' independent uniform rounding errors plus the total's half unit. Shared by the
 * balance checks and by the readers' checks of totals and subtotals.
 */
export function roundingBound(unit: number, parts: number): number {
  return unit * Math.min(0.5 * (parts + 1), 6 * Math.sqrt(parts / 12) + 0.5);
}
