/**
 * Subtotals of a contiguous run, found in near-linear time.
 *
 * A line (a value-added row, a final-demand column) is a subtotal when it equals, at every one of
 * K positions (the sector columns, or the sector rows), the sum of the two or more lines right
 * before it or right after it. Trying every length of run for every line costs the cube of the
 * number of adjacent lines (20,000 final-demand columns: hours). Here each line of a run gets a
 * fingerprint, the sum over the positions of its values times fixed pseudo-random weights in
 * [1, 2); the fingerprint of a run is a difference of prefix sums, so the runs whose fingerprint
 * is within the tolerance of the line's own are found by binary search in the sorted prefix sums.
 * The window is wide enough never to miss a run that matches at every position (the weights are
 * positive and the tolerance bound is the largest any position allows), and each run found is
 * then checked position by position exactly as before, nearest first, before-runs before
 * after-runs. The fixture that made this rule: the 3 × 20,000-column CSV of test/io/layout-scale.
 */
import { roundingBound } from '../../../engine/rounding';

export interface RunSubtotalInput {
  /** Lines of one maximal run, in order. */
  count: number;
  /** Positions per line. */
  positions: number;
  /** Value of line l at position k (NaN is read as zero). */
  at: (l: number, k: number) => number;
  /** The rounding unit of the data (0 when unknown). */
  unit: number;
  /** How far line t may miss the sum of `parts` lines at one position and still be their subtotal. */
  tol: (found: number, sum: number, parts: number) => number;
  /** Whether line l may be judged (roles a user gave are never changed). */
  judged: (l: number) => boolean;
}

export interface RunSubtotal {
  /** The subtotal line. */
  line: number;
  /** The first and last line of its parts (lo ≤ hi). */
  lo: number;
  hi: number;
}

/** Fixed weights in [1, 2) (a deterministic sequence, so results never depend on the run). */
function weights(k: number): Float64Array {
  const w = new Float64Array(k);
  let s = 0x9e3779b9;
  for (let i = 0; i < k; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    w[i] = 1 + s / 4294967296;
  }
  return w;
}

const num = (v: number): number => (v === v ? v : 0);

/**
 * The subtotals of one run of adjacent lines, each line in order: the nearest run of two or more
 * lines right before it (not reaching back past a line already found to be a subtotal) that it is
 * the sum of, else the nearest right after it. A subtotal must also be nonzero at more than half
 * of the positions.
 */
export function runSubtotals(input: RunSubtotalInput): RunSubtotal[] {
  const { count: m, positions: K, at, tol, judged } = input;
  const out: RunSubtotal[] = [];
  if (m < 3 || K === 0) return out;
  const w = weights(K);
  // Fingerprints: h[l] is the weighted sum of lines 0..l-1; abs[k] bounds the rounding error.
  const h = new Float64Array(m + 1);
  const own = new Float64Array(m);
  let absSum = 0;
  for (let l = 0; l < m; l++) {
    let f = 0;
    for (let k = 0; k < K; k++) {
      const x = num(at(l, k));
      f += w[k]! * x;
      absSum += w[k]! * Math.abs(x);
    }
    own[l] = f;
    h[l + 1] = h[l]! + f;
  }
  const order = Array.from({ length: m + 1 }, (_, i) => i).sort((a, b) => h[a]! - h[b]! || a - b);
  const sortedH = Float64Array.from(order, (i) => h[i]!);
  const lowerBound = (x: number): number => {
    let lo = 0;
    let hi = sortedH.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (sortedH[mid]! < x) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  /** Prefix indices u with h[u] within [x - r, x + r] and lo ≤ u ≤ hi. */
  const near = (x: number, r: number, lo: number, hi: number): number[] => {
    const found: number[] = [];
    if (lo > hi) return found;
    for (let q = lowerBound(x - r); q < sortedH.length && sortedH[q]! <= x + r; q++) {
      const u = order[q]!;
      if (u >= lo && u <= hi) found.push(u);
    }
    return found;
  };
  const floatSlack = 1e-9 * absSum + 1e-12;
  /** Whether line t is the sum of lines `from` stepping by `dir` for `len` lines, as the data say at every position. */
  const sums = (t: number, from: number, dir: number, len: number): boolean => {
    let nonzero = 0;
    for (let k = 0; k < K; k++) {
      let sum = 0;
      for (let i = 0, p = from; i < len; i++, p += dir) sum += num(at(p, k));
      const found = num(at(t, k));
      if (Math.abs(found - sum) > tol(found, sum, len)) return false;
      if (found !== 0) nonzero++;
    }
    return nonzero * 2 > K;
  };
  const absF = new Float64Array(K);
  /**
   * The most the fingerprint of a run of `len` lines may miss the line's own and still match at
   * every position: the tolerance at each position (its rounding term, never more than 2% of a sum
   * within that of the line's value; and the relative term) times its weight, plus float slack.
   */
  const radiusOf = (len: number): number => {
    const rb = roundingBound(input.unit, len);
    let r = floatSlack;
    for (let k = 0; k < K; k++) r += w[k]! * 1.001 * (Math.min(rb, 0.02 * (absF[k]! + rb)) + 1e-9 * (absF[k]! + rb + 1));
    return r;
  };
  let segStart = 0; // lines before it are cut off by a subtotal found
  for (let t = 0; t < m; t++) {
    if (!judged(t)) continue;
    // Nonzero at more than half the positions.
    let nonzero = 0;
    for (let k = 0; k < K; k++) {
      const f = num(at(t, k));
      absF[k] = Math.abs(f);
      if (f !== 0) nonzero++;
    }
    if (nonzero * 2 <= K) continue;
    const radius = radiusOf(m);
    const f = own[t]!;
    const close = (sum: number, len: number) => Math.abs(sum - f) <= radiusOf(len);
    // Before: parts u..t-1 (length t-u ≥ 2), u ≥ segStart; sum = h[t] - h[u].
    const before = near(h[t]! - f, radius, segStart, t - 2).sort((a, b) => b - a);
    let hit: RunSubtotal | undefined;
    for (const u of before) {
      if (close(h[t]! - h[u]!, t - u) && sums(t, t - 1, -1, t - u)) {
        hit = { line: t, lo: u, hi: t - 1 };
        break;
      }
    }
    if (!hit) {
      // After: parts t+1..v-1 (length v-t-1 ≥ 2); sum = h[v] - h[t+1].
      const after = near(h[t + 1]! + f, radius, t + 3, m).sort((a, b) => a - b);
      for (const v of after) {
        if (close(h[v]! - h[t + 1]!, v - t - 1) && sums(t, t + 1, 1, v - t - 1)) {
          hit = { line: t, lo: t + 1, hi: v - 1 };
          break;
        }
      }
    }
    if (hit) {
      out.push(hit);
      segStart = t + 1;
    }
  }
  return out;
}

/** Maximal runs of adjacent indices whose role is one of `kinds`: [first, last] pairs. */
export function maximalRuns(roles: readonly string[], kinds: readonly string[]): [number, number][] {
  const out: [number, number][] = [];
  for (let i = 0; i < roles.length; ) {
    if (!kinds.includes(roles[i]!)) {
      i++;
      continue;
    }
    let j = i;
    while (j + 1 < roles.length && kinds.includes(roles[j + 1]!)) j++;
    out.push([i, j]);
    i = j + 1;
  }
  return out;
}
