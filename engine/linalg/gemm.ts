/**
 * C ← C − A B on row-major blocks inside larger arrays: the kernel under the blocked LU, the
 * blocked triangular solves and the inverse (pure JavaScript).
 *
 * Sizes: C is `m × nc`, A is `m × kc`, B is `kc × nc`. Each block starts at an offset in its
 * array and has a leading dimension (the stride between rows). A, B and C may share one array
 * provided the three blocks do not overlap.
 *
 * Order of operations (the contract shared with the WebAssembly SIMD kernel in
 * `assembly/kernels.ts`, so that both give the same bits): the depth is cut into chunks of
 * `KC`; for each element of C and each chunk in turn, the products a₍i,p₎ b₍p,j₎ are summed in
 * increasing p starting from zero, and the sum is subtracted from the element. No product is
 * skipped (a zero times an infinity stays NaN, as in the SIMD kernel).
 *
 * The loops pack each `KC × NC` tile of B by groups of four columns (so that the inner loop
 * reads consecutive doubles) and hold a 2 × 4 tile of sums in locals (eight multiply-adds per
 * six loads); clean-up loops take the remainders.
 *
 * @example
 * const a = new Float64Array([1, 2]); // 1 × 2
 * const b = new Float64Array([3, 4]); // 2 × 1
 * const c = new Float64Array([10]);   // 1 × 1
 * gemmSub(1, 1, 2, a, 0, 2, b, 0, 1, c, 0, 1); // c[0] === 10 − (1·3 + 2·4) === -1
 */

/** Depth of one chunk (must equal KC in assembly/kernels.ts; a test checks it). */
export const KC = 256;
/** Columns of one tile of B (a speed setting only; it does not change results). */
export const NC = 256;

let pack: Float64Array = new Float64Array(0);

/** The packing scratch (grown on demand; JavaScript runs one call at a time per thread). */
function packBuffer(length: number): Float64Array {
  if (pack.length < length) pack = new Float64Array(Math.max(length, KC * NC));
  return pack;
}

export function gemmSub(
  m: number,
  nc: number,
  kc: number,
  a: Float64Array,
  aOff: number,
  lda: number,
  b: Float64Array,
  bOff: number,
  ldb: number,
  c: Float64Array,
  cOff: number,
  ldc: number,
): void {
  if (m <= 0 || nc <= 0 || kc <= 0) return;
  for (let p0 = 0; p0 < kc; p0 += KC) {
    const pe = Math.min(p0 + KC, kc);
    const depth = pe - p0;
    for (let j0 = 0; j0 < nc; j0 += NC) {
      const je = Math.min(j0 + NC, nc);
      // Pack the whole groups of four columns of B[p0..pe) × [j0..je) so that the inner loop
      // reads consecutive doubles: group g, row p at bp[(g·depth + p − p0)·4 ...].
      const quads = (je - j0) >> 2;
      const jq = j0 + quads * 4;
      const bp = packBuffer(quads * depth * 4);
      for (let g = 0; g < quads; g++) {
        let src = bOff + p0 * ldb + j0 + g * 4;
        let dst = g * depth * 4;
        for (let p = p0; p < pe; p++) {
          bp[dst] = b[src]!;
          bp[dst + 1] = b[src + 1]!;
          bp[dst + 2] = b[src + 2]!;
          bp[dst + 3] = b[src + 3]!;
          src += ldb;
          dst += 4;
        }
      }
      let i = 0;
      for (; i + 1 < m; i += 2) {
        const a0 = aOff + i * lda;
        const a1 = a0 + lda;
        const c0 = cOff + i * ldc;
        const c1 = c0 + ldc;
        for (let g = 0; g < quads; g++) {
          const j = j0 + g * 4;
          let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s10 = 0, s11 = 0, s12 = 0, s13 = 0;
          let q = g * depth * 4;
          for (let p = p0; p < pe; p++) {
            const x0 = a[a0 + p]!;
            const x1 = a[a1 + p]!;
            const u0 = bp[q]!, u1 = bp[q + 1]!, u2 = bp[q + 2]!, u3 = bp[q + 3]!;
            s00 += x0 * u0;
            s01 += x0 * u1;
            s02 += x0 * u2;
            s03 += x0 * u3;
            s10 += x1 * u0;
            s11 += x1 * u1;
            s12 += x1 * u2;
            s13 += x1 * u3;
            q += 4;
          }
          c[c0 + j] = c[c0 + j]! - s00;
          c[c0 + j + 1] = c[c0 + j + 1]! - s01;
          c[c0 + j + 2] = c[c0 + j + 2]! - s02;
          c[c0 + j + 3] = c[c0 + j + 3]! - s03;
          c[c1 + j] = c[c1 + j]! - s10;
          c[c1 + j + 1] = c[c1 + j + 1]! - s11;
          c[c1 + j + 2] = c[c1 + j + 2]! - s12;
          c[c1 + j + 3] = c[c1 + j + 3]! - s13;
        }
        for (let j = jq; j < je; j++) {
          let s0 = 0, s1 = 0;
          let q = bOff + p0 * ldb + j;
          for (let p = p0; p < pe; p++) {
            const u = b[q]!;
            s0 += a[a0 + p]! * u;
            s1 += a[a1 + p]! * u;
            q += ldb;
          }
          c[c0 + j] = c[c0 + j]! - s0;
          c[c1 + j] = c[c1 + j]! - s1;
        }
      }
      if (i < m) {
        const a0 = aOff + i * lda;
        const c0 = cOff + i * ldc;
        for (let g = 0; g < quads; g++) {
          const j = j0 + g * 4;
          let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
          let q = g * depth * 4;
          for (let p = p0; p < pe; p++) {
            const x = a[a0 + p]!;
            s0 += x * bp[q]!;
            s1 += x * bp[q + 1]!;
            s2 += x * bp[q + 2]!;
            s3 += x * bp[q + 3]!;
            q += 4;
          }
          c[c0 + j] = c[c0 + j]! - s0;
          c[c0 + j + 1] = c[c0 + j + 1]! - s1;
          c[c0 + j + 2] = c[c0 + j + 2]! - s2;
          c[c0 + j + 3] = c[c0 + j + 3]! - s3;
        }
        let j = jq;
        for (; j < je; j++) {
          let s = 0;
          let q = bOff + p0 * ldb + j;
          for (let p = p0; p < pe; p++) {
            s += a[a0 + p]! * b[q]!;
            q += ldb;
          }
          c[c0 + j] = c[c0 + j]! - s;
        }
      }
    }
  }
}
