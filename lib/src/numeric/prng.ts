/**
 * Seeded pseudo-random numbers of our own, so fits with bootstrap and synthetic test data are
 * reproducible in every JavaScript engine: xoshiro128** (D. Blackman, S. Vigna, "Scrambled linear
 * pseudorandom number generators", ACM TOMS 47, 36 (2021)) seeded by splitmix32, and standard
 * normal deviates by the Box-Muller transform (G. Box, M. Muller, Ann. Math. Stat. 29, 610 (1958)).
 */
export interface Random {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Standard normal deviate. */
  normal(): number;
  /** Integer in [0, n). */
  integer(n: number): number;
}

export function seededRandom(seed: number): Random {
  let s = seed >>> 0;
  const splitmix = () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
  let a = splitmix();
  let b = splitmix();
  let c = splitmix();
  let d = splitmix();
  if ((a | b | c | d) === 0) a = 1;
  const next = () => {
    const result = Math.imul(rotl(Math.imul(b, 5) >>> 0, 7), 9) >>> 0;
    const t = (b << 9) >>> 0;
    c ^= a;
    d ^= b;
    b ^= c;
    a ^= d;
    c ^= t;
    d = rotl(d, 11);
    return result;
  };
  let spare: number | null = null;
  const uniform = () => ((next() >>> 11) * 4294967296 + next()) / 9007199254740992;
  return {
    uniform,
    normal() {
      if (spare !== null) {
        const v = spare;
        spare = null;
        return v;
      }
      let u = 0;
      while (u === 0) u = uniform();
      const v = uniform();
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(2 * Math.PI * v);
      return r * Math.cos(2 * Math.PI * v);
    },
    integer(n: number) {
      return Math.floor(uniform() * n);
    },
  };
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
