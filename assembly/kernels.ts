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

// ---------------------------------------------------------------------------------------------
// The narrow pieces of the LU (mirrored exactly by engine/linalg/lu.ts, which runs them in
// JavaScript when the matrix is not in this memory): element operations only, in the same
// order, so the bits agree.

/**
 * Factor columns c0..c1−1 on rows c0..n−1 of the n × n row-major matrix at element offset `a`,
 * with partial pivoting: copy the panel to `buf` (rows × w doubles), factor it there (the next
 * pivot search riding along each column update), write it back, apply the interchanges to the
 * rest of each row, and store the pivot rows (0-based, global) as i32 at element offset `piv`.
 * Returns LAPACK's info updated (the 1-based column of the first zero pivot, or `info`).
 */
export function panelBase(n: i32, c0: i32, c1: i32, a: i32, buf: i32, piv: i32, info: i32): i32 {
  const w = c1 - c0;
  const rows = n - c0;
  const A = addr(a);
  const B = addr(buf);
  const P = (<usize>piv) << 2;
  for (let i = 0; i < rows; i++) {
    const src = A + (<usize>((c0 + i) * n + c0) << 3);
    const dst = B + (<usize>(i * w) << 3);
    for (let j = 0; j < w; j++) store<f64>(dst + (<usize>j << 3), load<f64>(src + (<usize>j << 3)));
  }
  let next = -1;
  for (let k = 0; k < w; k++) {
    let p = next;
    if (p < 0) {
      p = k;
      let best = abs<f64>(load<f64>(B + (<usize>(k * w + k) << 3)));
      for (let i = k + 1; i < rows; i++) {
        const v = abs<f64>(load<f64>(B + (<usize>(i * w + k) << 3)));
        if (v > best) {
          best = v;
          p = i;
        }
      }
    }
    next = -1;
    store<i32>(P + (<usize>k << 2), c0 + p);
    const rk = B + (<usize>(k * w) << 3);
    if (p != k) {
      const rp = B + (<usize>(p * w) << 3);
      for (let j = 0; j < w; j++) {
        const q = <usize>j << 3;
        const t = load<f64>(rk + q);
        store<f64>(rk + q, load<f64>(rp + q));
        store<f64>(rp + q, t);
      }
    }
    const d = load<f64>(rk + (<usize>k << 3));
    if (d == 0.0) {
      if (info == 0) info = c0 + k + 1;
      continue;
    }
    const inv = 1.0 / d;
    const k1 = k + 1;
    if (k1 < w) {
      let np = k1;
      let best = -1.0;
      for (let i = k1; i < rows; i++) {
        const ri = B + (<usize>(i * w) << 3);
        const l = load<f64>(ri + (<usize>k << 3)) * inv;
        store<f64>(ri + (<usize>k << 3), l);
        if (l != 0.0) {
          for (let j = k1; j < w; j++) {
            const q = <usize>j << 3;
            store<f64>(ri + q, load<f64>(ri + q) - l * load<f64>(rk + q));
          }
        }
        const v = abs<f64>(load<f64>(ri + (<usize>k1 << 3)));
        if (i == k1) best = v;
        else if (v > best) {
          best = v;
          np = i;
        }
      }
      next = np;
    } else {
      for (let i = k1; i < rows; i++) {
        const q = B + (<usize>(i * w + k) << 3);
        store<f64>(q, load<f64>(q) * inv);
      }
    }
  }
  for (let i = 0; i < rows; i++) {
    const dst = A + (<usize>((c0 + i) * n + c0) << 3);
    const src = B + (<usize>(i * w) << 3);
    for (let j = 0; j < w; j++) store<f64>(dst + (<usize>j << 3), load<f64>(src + (<usize>j << 3)));
  }
  for (let k = c0; k < c1; k++) {
    const p = load<i32>(P + (<usize>(k - c0) << 2));
    if (p == k) continue;
    swapRange(A + (<usize>(k * n) << 3), A + (<usize>(p * n) << 3), 0, c0);
    swapRange(A + (<usize>(k * n) << 3), A + (<usize>(p * n) << 3), c1, n);
  }
  return info;
}

function swapRange(x: usize, y: usize, j0: i32, j1: i32): void {
  let j = j0;
  for (; j + 1 < j1; j += 2) {
    const q = <usize>j << 3;
    const t = v128.load(x + q);
    v128.store(x + q, v128.load(y + q));
    v128.store(y + q, t);
  }
  for (; j < j1; j++) {
    const q = <usize>j << 3;
    const t = load<f64>(x + q);
    store<f64>(x + q, load<f64>(y + q));
    store<f64>(y + q, t);
  }
}

/** x[0..r) ← x − v·y on rows (f64x2, then one at a time). */
// @ts-ignore: decorator
@inline
function rowSub(x: usize, y: usize, v: f64, r: i32): void {
  const vv = f64x2.splat(v);
  let j = 0;
  for (; j + 1 < r; j += 2) {
    const q = <usize>j << 3;
    v128.store(x + q, f64x2.sub(v128.load(x + q), f64x2.mul(vv, v128.load(y + q))));
  }
  for (; j < r; j++) {
    const q = <usize>j << 3;
    store<f64>(x + q, load<f64>(x + q) - v * load<f64>(y + q));
  }
}

// @ts-ignore: decorator
@inline
function rowScale(x: usize, d: f64, r: i32): void {
  const dd = f64x2.splat(d);
  let j = 0;
  for (; j + 1 < r; j += 2) {
    const q = <usize>j << 3;
    v128.store(x + q, f64x2.mul(v128.load(x + q), dd));
  }
  for (; j < r; j++) {
    const q = <usize>j << 3;
    store<f64>(x + q, load<f64>(x + q) * d);
  }
}

/**
 * X ← L⁻¹ X for a small m × m lower triangle L (unit diagonal unless `unit` is 0) at element
 * offset l (leading dimension ldl) and X m × r at x (leading dimension ldx); zero entries of L
 * are skipped.
 */
export function lowerBase(m: i32, r: i32, l: i32, ldl: i32, x: i32, ldx: i32, unit: i32): void {
  const L = addr(l);
  const X = addr(x);
  for (let i = 0; i < m; i++) {
    const xi = X + (<usize>(i * ldx) << 3);
    const li = L + (<usize>(i * ldl) << 3);
    for (let k = 0; k < i; k++) {
      const v = load<f64>(li + (<usize>k << 3));
      if (v == 0.0) continue;
      rowSub(xi, X + (<usize>(k * ldx) << 3), v, r);
    }
    if (unit == 0) rowScale(xi, 1.0 / load<f64>(li + (<usize>i << 3)), r);
  }
}

/** X ← U⁻¹ X for a small m × m upper triangle U (non-unit unless `unit` is 1); as `lowerBase`, bottom up. */
export function upperBase(m: i32, r: i32, l: i32, ldl: i32, x: i32, ldx: i32, unit: i32): void {
  const L = addr(l);
  const X = addr(x);
  for (let i = m - 1; i >= 0; i--) {
    const xi = X + (<usize>(i * ldx) << 3);
    const li = L + (<usize>(i * ldl) << 3);
    for (let k = i + 1; k < m; k++) {
      const v = load<f64>(li + (<usize>k << 3));
      if (v == 0.0) continue;
      rowSub(xi, X + (<usize>(k * ldx) << 3), v, r);
    }
    if (unit == 0) rowScale(xi, 1.0 / load<f64>(li + (<usize>i << 3)), r);
  }
}
