/**
 * Random streams: one independent generator per (seed, scenario id, purpose, key).
 *
 * Generator: Marsaglia's xorshift128 (G. Marsaglia, "Xorshift RNGs", J. Statistical Software
 * 8(14), 2003), with the seeding convention of seedrandom 3.0.5's `xor128` for integer seeds
 * (x = seed, y = z = w = 0, 64 outputs discarded) and its 53-bit `double()` construction, so a
 * `StreamRng` seeded with k yields bit for bit what `seedrandom.xor128(k).double()` yields (the
 * test checks it against seedrandom). It is re-implemented here on plain fields so that one
 * instance is reused scenario after scenario: no allocation and no closures per scenario.
 *
 * Stream key (documented in docs/sampler.md):
 *   s = seedHash(seed)                 number: its 32-bit halves; string: FNV-1a 32 of its UTF-16 units
 *   k = fmix(fmix(fmix(fmix(s ^ P0) ^ idLow) ^ idHigh) ^ purpose) ^ keyHash)
 * with fmix the MurmurHash3 32-bit finaliser (Appleby, public domain) and keyHash = FNV-1a 32 of a
 * source or load id. Distinct inputs give unrelated keys, so streams do not depend on the order,
 * the batch or the worker in which scenarios are drawn.
 */

/** Purposes of the sub-streams; each value is part of the hash, never reorder them. */
export const streamPurpose = {
  /** Scenario-level draws: hour, dip, outage duration. */
  scenario: 1,
  /** One per load id: forecast error. */
  load: 2,
  /** One per source id: availability, resource, state of charge. */
  source: 3,
  /** Latin hypercube permutations, one per (block, dimension). */
  latinHypercube: 4,
} as const;

/** Stands in for key 0, the all-zero state of xorshift128 (any nonzero constant works). */
const zeroKeySubstitute = 0x6d2b79f5;

// Odd 32-bit constant separating the seed from the id (golden-ratio constant, common practice).
const seedSalt = 0x9e3779b9;

/** MurmurHash3 32-bit finaliser: a bijective avalanche mix of a 32-bit word. */
export function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** FNV-1a 32-bit hash of the UTF-16 code units of a string. */
export function fnv1a32(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** 32-bit digest of the run seed (integer or string). */
export function seedHash(seed: number | string): number {
  if (typeof seed === 'string') return fmix32(fnv1a32(seed));
  const low = seed >>> 0;
  const high = Math.floor(seed / 0x100000000) >>> 0;
  return fmix32(fmix32(low) ^ high);
}

/** Key of the stream (seed, id, purpose, key) as a nonzero int32. */
export function streamKey(
  seedDigest: number,
  id: number,
  purpose: number,
  keyHash: number,
): number {
  let h = fmix32((seedDigest ^ seedSalt) >>> 0);
  h = fmix32((h ^ id) >>> 0);
  h = fmix32((h ^ Math.floor(id / 0x100000000)) >>> 0);
  h = fmix32((h ^ purpose) >>> 0);
  h = fmix32((h ^ keyHash) >>> 0);
  // xorshift128 with an all-zero state only returns zeros; remap the single bad key.
  return (h === 0 ? zeroKeySubstitute : h) | 0;
}

/** A reusable xorshift128 stream; `reseed` restarts it on a new key without allocating. */
export class StreamRng {
  private x = 0;
  private y = 0;
  private z = 0;
  private w = 0;

  constructor(key = 1) {
    this.reseed(key);
  }

  /**
   * Restarts the stream at `key` (an int32), exactly like seedrandom.xor128(key). Key 0 would
   * leave xorshift128 in its all-zero fixed point (only zeros, and `uniform` would never
   * return), so it is remapped like in `streamKey`.
   */
  reseed(key: number): void {
    this.x = key | 0 || zeroKeySubstitute;
    this.y = 0;
    this.z = 0;
    this.w = 0;
    for (let k = 0; k < 64; k++) this.nextInt32();
  }

  /** Next raw 32-bit output (signed), Marsaglia 2003 xor128 step. */
  nextInt32(): number {
    const t = this.x ^ (this.x << 11);
    this.x = this.y;
    this.y = this.z;
    this.z = this.w;
    this.w ^= (this.w >>> 19) ^ t ^ (t >>> 8);
    return this.w;
  }

  /** Uniform double in the open interval (0, 1) with 53 random bits. */
  uniform(): number {
    let u = 0;
    do {
      const top = this.nextInt32() >>> 11;
      const bottom = (this.nextInt32() >>> 0) / 0x100000000;
      u = (top + bottom) / 0x200000;
    } while (u === 0);
    return u;
  }
}
