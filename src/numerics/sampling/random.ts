/**
 * Seeded random numbers for Monte Carlo: the same seed gives the same numbers on every run
 * (32-bit integer arithmetic for the generator; see the note on normals below for platforms).
 *
 * - Generator: xoshiro128** (Blackman and Vigna, "Scrambled linear pseudorandom number
 *   generators", 2018), 128 bits of state, period 2^128 − 1; its state is filled from the
 *   seed by SplitMix32 (the 32-bit variant of Steele, Lea and Flood's SplitMix), so that no
 *   seed gives the all-zero state.
 * - Uniforms on (0, 1): 53 bits from two outputs, k / 2^53 + 2^-54 (never 0, never 1).
 * - Normals: Box–Muller (Box and Muller 1958), both values of each pair used. Note: the
 *   figures depend on Math.log, Math.cos and Math.sin, which ECMAScript does not require to
 *   be correctly rounded; V8 (Node, Chromium) uses the same fdlibm ports everywhere.
 */

/** A seeded generator of uniforms and standard normals. */
export interface Random {
  /** A uniform on the open interval (0, 1). */
  uniform(): number;
  /** A standard normal. */
  normal(): number;
}

/** The generator for a seed (a whole number; taken modulo 2^32). Cost: a few integer operations per number. */
export function seeded(seed: number): Random {
  let x = (seed >>> 0) | 0;
  const splitmix = (): number => {
    x = (x + 0x9e3779b9) | 0;
    let z = x;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
    return (z ^ (z >>> 16)) | 0;
  };
  let s0 = splitmix(), s1 = splitmix(), s2 = splitmix(), s3 = splitmix();
  if ((s0 | s1 | s2 | s3) === 0) s0 = 1;
  const next = (): number => {
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9);
    const t = s1 << 9;
    s2 ^= s0; s3 ^= s1; s1 ^= s2; s0 ^= s3;
    s2 ^= t;
    s3 = rotl(s3, 11);
    return result >>> 0;
  };
  const uniform = (): number => {
    const hi = next() >>> 5; // 27 bits
    const lo = next() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992 + 2 ** -54;
  };
  let spare = NaN;
  const normal = (): number => {
    if (!Number.isNaN(spare)) {
      const z = spare;
      spare = NaN;
      return z;
    }
    const r = Math.sqrt(-2 * Math.log(uniform()));
    const a = 2 * Math.PI * uniform();
    spare = r * Math.sin(a);
    return r * Math.cos(a);
  };
  return { uniform, normal };
}

function rotl(v: number, k: number): number {
  return (v << k) | (v >>> (32 - k));
}

/** The raw 32-bit outputs of xoshiro128** from a given 128-bit state, for checking against the reference code. */
export function xoshiro128ss(state: readonly [number, number, number, number], count: number): number[] {
  let [s0, s1, s2, s3] = state.map((v) => v | 0);
  const out: number[] = [];
  for (let i = 0; i < count; i++) {
    out.push(Math.imul(rotl(Math.imul(s1, 5), 7), 9) >>> 0);
    const t = s1 << 9;
    s2 ^= s0; s3 ^= s1; s1 ^= s2; s0 ^= s3;
    s2 ^= t;
    s3 = rotl(s3, 11);
  }
  return out;
}
