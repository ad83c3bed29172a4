// AssemblyScript source of the WebAssembly SIMD kernels (f64x2) under engine/linalg/.
// Built by `npm run build:wasm` (scripts/build-wasm.mjs) into engine/linalg/wasm-module.ts,
// which embeds the bytes as base64; test/engine/large/wasm.test.ts checks that the committed
// module matches this source.
//
// Contract (mirrored exactly by the pure-JS kernel in engine/linalg/gemm.ts, so that both give
// the same bits): C ← C − A B, C is m × n, A is m × k, B is k × n, row-major blocks at element
// offsets aOff, bOff, cOff in this module's memory with leading dimensions lda, ldb, ldc.
// The depth k is cut into chunks of KC; for every element and chunk the products are summed
// in order from zero, a₍i,p₀₎b₍p₀,j₎ + a₍i,p₀+1₎b₍p₀+1,j₎ + …, and the sum is subtracted
// from C. `pack` is the element offset of a private scratch area of PACK_LENGTH doubles (one
// per thread when several threads share the memory).

const MR: i32 = 4; // rows of the register tile
const NR: i32 = 4; // columns of the register tile (two f64x2)
const KC: i32 = 256; // depth of one chunk
const MC: i32 = 96; // rows of A packed at once
const NC: i32 = 1024; // columns of B packed at once

export function kc(): i32 {
  return KC;
}

/** Doubles of scratch one call needs: packed A (MC × KC) and packed B (KC × NC) plus a tile. */
export function packLength(): i32 {
  return MC * KC + KC * NC + MR * NR;
}

// @ts-ignore: decorator
@inline
function addr(off: i32): usize {
  return (<usize>off) << 3;
}

/** Pack rows i0..i0+mc−1, columns p0..p0+kc−1 of A into MR-row panels, zero-padded. */
function packA(mc: i32, kc: i32, a: usize, lda: i32, ap: usize): void {
  for (let ir = 0; ir < mc; ir += MR) {
    const rows = min(MR, mc - ir);
    const base = ap + (<usize>(ir * kc) << 3);
    for (let r = 0; r < MR; r++) {
      if (r < rows) {
        const src = a + (<usize>((ir + r) * lda) << 3);
        for (let p = 0; p < kc; p++) {
          store<f64>(base + (<usize>(p * MR + r) << 3), load<f64>(src + (<usize>p << 3)));
        }
      } else {
        for (let p = 0; p < kc; p++) store<f64>(base + (<usize>(p * MR + r) << 3), 0.0);
      }
    }
  }
}

/** Pack rows 0..kc−1, columns j0..j0+nc−1 of B into NR-column panels, zero-padded. */
function packB(kc: i32, nc: i32, b: usize, ldb: i32, bp: usize): void {
  for (let jr = 0; jr < nc; jr += NR) {
    const cols = min(NR, nc - jr);
    const base = bp + (<usize>(jr * kc) << 3);
    if (cols == NR) {
      for (let p = 0; p < kc; p++) {
        const src = b + (<usize>(p * ldb + jr) << 3);
        const dst = base + (<usize>(p * NR) << 3);
        v128.store(dst, v128.load(src));
        v128.store(dst + 16, v128.load(src + 16));
      }
    } else {
      for (let p = 0; p < kc; p++) {
        const src = b + (<usize>(p * ldb + jr) << 3);
        const dst = base + (<usize>(p * NR) << 3);
        for (let c = 0; c < NR; c++) store<f64>(dst + (<usize>c << 3), c < cols ? load<f64>(src + (<usize>c << 3)) : 0.0);
      }
    }
  }
}

/** C[mr × nr] −= Ap Bp over kc, with the 4 × 4 tile of sums held in eight f64x2 registers. */
function micro(kc: i32, ap: usize, bp: usize, c: usize, ldc: i32, mr: i32, nr: i32, tile: usize): void {
  let c00 = f64x2.splat(0.0);
  let c01 = f64x2.splat(0.0);
  let c10 = f64x2.splat(0.0);
  let c11 = f64x2.splat(0.0);
  let c20 = f64x2.splat(0.0);
  let c21 = f64x2.splat(0.0);
  let c30 = f64x2.splat(0.0);
  let c31 = f64x2.splat(0.0);
  for (let p = 0; p < kc; p++) {
    const b0 = v128.load(bp);
    const b1 = v128.load(bp, 16);
    let a = v128.load64_splat(ap);
    c00 = f64x2.add(c00, f64x2.mul(a, b0));
    c01 = f64x2.add(c01, f64x2.mul(a, b1));
    a = v128.load64_splat(ap, 8);
    c10 = f64x2.add(c10, f64x2.mul(a, b0));
    c11 = f64x2.add(c11, f64x2.mul(a, b1));
    a = v128.load64_splat(ap, 16);
    c20 = f64x2.add(c20, f64x2.mul(a, b0));
    c21 = f64x2.add(c21, f64x2.mul(a, b1));
    a = v128.load64_splat(ap, 24);
    c30 = f64x2.add(c30, f64x2.mul(a, b0));
    c31 = f64x2.add(c31, f64x2.mul(a, b1));
    ap += 32;
    bp += 32;
  }
  const ld = <usize>ldc << 3;
  if (mr == MR && nr == NR) {
    let r = c;
    v128.store(r, f64x2.sub(v128.load(r), c00));
    v128.store(r, f64x2.sub(v128.load(r, 16), c01), 16);
    r += ld;
    v128.store(r, f64x2.sub(v128.load(r), c10));
    v128.store(r, f64x2.sub(v128.load(r, 16), c11), 16);
    r += ld;
    v128.store(r, f64x2.sub(v128.load(r), c20));
    v128.store(r, f64x2.sub(v128.load(r, 16), c21), 16);
    r += ld;
    v128.store(r, f64x2.sub(v128.load(r), c30));
    v128.store(r, f64x2.sub(v128.load(r, 16), c31), 16);
  } else {
    v128.store(tile, c00);
    v128.store(tile, c01, 16);
    v128.store(tile, c10, 32);
    v128.store(tile, c11, 48);
    v128.store(tile, c20, 64);
    v128.store(tile, c21, 80);
    v128.store(tile, c30, 96);
    v128.store(tile, c31, 112);
    for (let i = 0; i < mr; i++) {
      const row = c + <usize>i * ld;
      for (let j = 0; j < nr; j++) {
        const q = row + (<usize>j << 3);
        store<f64>(q, load<f64>(q) - load<f64>(tile + (<usize>(i * NR + j) << 3)));
      }
    }
  }
}

/** C ← C − A B (see the contract at the top of this file). */
export function gemmSub(
  m: i32,
  n: i32,
  k: i32,
  aOff: i32,
  lda: i32,
  bOff: i32,
  ldb: i32,
  cOff: i32,
  ldc: i32,
  pack: i32,
): void {
  if (m <= 0 || n <= 0 || k <= 0) return;
  const ap = addr(pack);
  const bp = ap + (<usize>(MC * KC) << 3);
  const tile = bp + (<usize>(KC * NC) << 3);
  for (let j0 = 0; j0 < n; j0 += NC) {
    const nc = min(NC, n - j0);
    for (let p0 = 0; p0 < k; p0 += KC) {
      const kc = min(KC, k - p0);
      packB(kc, nc, addr(bOff + p0 * ldb + j0), ldb, bp);
      for (let i0 = 0; i0 < m; i0 += MC) {
        const mc = min(MC, m - i0);
        packA(mc, kc, addr(aOff + i0 * lda + p0), lda, ap);
        for (let jr = 0; jr < nc; jr += NR) {
          const nr = min(NR, nc - jr);
          const bpan = bp + (<usize>(jr * kc) << 3);
          for (let ir = 0; ir < mc; ir += MR) {
            const mr = min(MR, mc - ir);
            micro(kc, ap + (<usize>(ir * kc) << 3), bpan, addr(cOff + (i0 + ir) * ldc + j0 + jr), ldc, mr, nr, tile);
          }
        }
      }
    }
  }
}
