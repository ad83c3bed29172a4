/**
 * A small seeded pseudo-random generator with normal draws, for reproducible Monte Carlo.
 *
 * Algorithm (stated so that anyone can reproduce a run):
 * - Generator: xoshiro128** (D. Blackman and S. Vigna, "Scrambled linear pseudorandom number
 *   generators", ACM TOMS 47, 2021): four 32-bit words of state, period 2¹²⁸ − 1, output
 *   rotl(s₁ · 5, 7) · 9.
 * - Seeding: the state is derived from a key of two integers, `seed` and `stream` (each a
 *   whole number in 0 … 2⁵³ − 1, split into high and low 32-bit words). State word t is
 *   h = C_t, then for each key word w in the order seedLo, seedHi, streamHi, streamLo:
 *   h = fmix32((h ⊕ w) + 0x9e3779b9), where fmix32 is the 32-bit finaliser of MurmurHash3.
 *   For a fixed seed the map from `stream` (below 2³²) to word 0 is one-to-one, so two draws
 *   of one run never share a state. A Monte Carlo run uses `stream` = the draw index, so a
 *   draw's numbers depend only on the seed and its index (not on how draws are split
 *   among workers).
 * - Uniform: 53 bits from two outputs, (a >>> 5) · 2²⁶ + (b >>> 6), divided by 2⁵³: [0, 1).
 * - Normal: Box–Muller (G. E. P. Box and M. E. Muller, 1958) on u₁ = 1 − uniform ∈ (0, 1] and
 *   u₂ = uniform: r = √(−2 ln u₁), z₀ = r cos 2πu₂, z₁ = r sin 2πu₂; z₀ is returned first and
 *   z₁ is kept for the next call.
 *
 * @example
 * const r = new Random(42, 0);
 * r.uniform(); // a number in [0, 1), the same every time for seed 42, stream 0
 * r.normal();  // a standard normal draw
 */
import { InputError } from './errors';

const GOLDEN = 0x9e3779b9;
const WORD_CONSTANTS = [0x243f6a88, 0x85a308d3, 0x13198a2e, 0x03707344];
const TWO_32 = 4294967296;

/** MurmurHash3's 32-bit finaliser: a bijection on 32-bit words. */
function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

function checkKey(value: number, what: string): void {
  if (!Number.isSafeInteger(value) || value < 0) {
    throw new InputError('bad-seed', `the ${what} must be a whole number from 0 to 2^53 − 1; got ${value}`, { text: String(value) });
  }
}

export class Random {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spare = 0;
  private hasSpare = false;

  /** A generator for one (seed, stream) key. */
  constructor(seed: number, stream = 0) {
    checkKey(seed, 'seed');
    checkKey(stream, 'stream index');
    const key = [seed >>> 0, Math.floor(seed / TWO_32) >>> 0, Math.floor(stream / TWO_32) >>> 0, stream >>> 0];
    const s = WORD_CONSTANTS.map((c) => {
      let h = c;
      for (const w of key) h = fmix32(((h ^ w) + GOLDEN) >>> 0);
      return h;
    });
    this.s0 = s[0]!;
    this.s1 = s[1]!;
    this.s2 = s[2]!;
    this.s3 = s[3]!;
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = GOLDEN; // cannot happen; kept for safety
  }

  /** The next 32-bit output, as an unsigned integer. */
  uint32(): number {
    const s1 = this.s1;
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9) >>> 0;
    const t = s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** A uniform number in [0, 1) with 53 random bits. */
  uniform(): number {
    const a = this.uint32() >>> 5;
    const b = this.uint32() >>> 6;
    return (a * 67108864 + b) / 9007199254740992;
  }

  /** A standard normal draw (Box–Muller, both values used). */
  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    const u1 = 1 - this.uniform();
    const u2 = this.uniform();
    const r = Math.sqrt(-2 * Math.log(u1));
    const t = 2 * Math.PI * u2;
    this.spare = r * Math.sin(t);
    this.hasSpare = true;
    return r * Math.cos(t);
  }

  /** Fill `out` with standard normal draws. */
  fillNormal(out: Float64Array): Float64Array {
    for (let i = 0; i < out.length; i++) out[i] = this.normal();
    return out;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}

/** The generator of draw `index` of a run with this seed: the stream a Monte Carlo draw uses. */
export function drawStream(seed: number, index: number): Random {
  return new Random(seed, index);
}
