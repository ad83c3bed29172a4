/**
 * C ← C − A B on row-major blocks inside larger arrays: the kernel under the blocked LU, the
 * blocked triangular solves and the inverse.
 *
 * Sizes: C is `m × nc`, A is `m × kc`, B is `kc × nc`. Each block starts at an offset in its
 * array and has a leading dimension (the stride between rows). A, B and C may share one array
 * provided the three blocks do not overlap.
 *
 * The loops are tiled over p (depth) and j (columns) so that the B tile stays in cache, and
 * the inner loop updates two rows of C from four rows of B at once (eight multiply-adds per
 * four loads of B), with clean-up loops for the remainders.
 *
 * @example
 * const a = new Float64Array([1, 2]); // 1 × 2
 * const b = new Float64Array([3, 4]); // 2 × 1
 * const c = new Float64Array([10]);   // 1 × 1
 * gemmSub(1, 1, 2, a, 0, 2, b, 0, 1, c, 0, 1); // c[0] === 10 − (1·3 + 2·4) === -1
 */
export const KC = 128;
export const NC = 512;

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
    for (let j0 = 0; j0 < nc; j0 += NC) {
      const je = Math.min(j0 + NC, nc);
      let i = 0;
      for (; i + 1 < m; i += 2) {
        const c0 = cOff + i * ldc;
        const c1 = c0 + ldc;
        const a0 = aOff + i * lda;
        const a1 = a0 + lda;
        let p = p0;
        for (; p + 3 < pe; p += 4) {
          const l00 = a[a0 + p]!, l01 = a[a0 + p + 1]!, l02 = a[a0 + p + 2]!, l03 = a[a0 + p + 3]!;
          const l10 = a[a1 + p]!, l11 = a[a1 + p + 1]!, l12 = a[a1 + p + 2]!, l13 = a[a1 + p + 3]!;
          const b0 = bOff + p * ldb;
          const b1 = b0 + ldb;
          const b2 = b1 + ldb;
          const b3 = b2 + ldb;
          for (let j = j0; j < je; j++) {
            const u0 = b[b0 + j]!, u1 = b[b1 + j]!, u2 = b[b2 + j]!, u3 = b[b3 + j]!;
            c[c0 + j] = c[c0 + j]! - (l00 * u0 + l01 * u1 + l02 * u2 + l03 * u3);
            c[c1 + j] = c[c1 + j]! - (l10 * u0 + l11 * u1 + l12 * u2 + l13 * u3);
          }
        }
        for (; p < pe; p++) {
          const l0 = a[a0 + p]!;
          const l1 = a[a1 + p]!;
          const b0 = bOff + p * ldb;
          for (let j = j0; j < je; j++) {
            const u = b[b0 + j]!;
            c[c0 + j] = c[c0 + j]! - l0 * u;
            c[c1 + j] = c[c1 + j]! - l1 * u;
          }
        }
      }
      if (i < m) {
        const c0 = cOff + i * ldc;
        const a0 = aOff + i * lda;
        let p = p0;
        for (; p + 3 < pe; p += 4) {
          const l0 = a[a0 + p]!, l1 = a[a0 + p + 1]!, l2 = a[a0 + p + 2]!, l3 = a[a0 + p + 3]!;
          const b0 = bOff + p * ldb;
          const b1 = b0 + ldb;
          const b2 = b1 + ldb;
          const b3 = b2 + ldb;
          for (let j = j0; j < je; j++) {
            c[c0 + j] = c[c0 + j]! - (l0 * b[b0 + j]! + l1 * b[b1 + j]! + l2 * b[b2 + j]! + l3 * b[b3 + j]!);
          }
        }
        for (; p < pe; p++) {
          const l0 = a[a0 + p]!;
          const b0 = bOff + p * ldb;
          for (let j = j0; j < je; j++) c[c0 + j] = c[c0 + j]! - l0 * b[b0 + j]!;
        }
      }
    }
  }
}
