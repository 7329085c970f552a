/**
 * Seeded pseudo-random numbers, so that `--seed` reproduces a run exactly.
 *
 * sfc32 (a small, fast counting generator) seeded through splitmix32. Each part of the
 * simulation draws from its own named stream (`createRng(seed, "bench:3")`), so adding a
 * sensor or a bench does not shift the numbers any other part sees.
 */
export interface Rng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [min, max). */
  uniform(min: number, max: number): number;
  /** Standard normal (mean 0, standard deviation 1), Box–Muller. */
  normal(): number;
  /** True with probability p. */
  chance(p: number): boolean;
  /** An integer in [0, n). */
  int(n: number): number;
}

/** FNV-1a over a string, to turn a stream name into 32 bits. */
function hashString(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i += 1) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

function splitmix32(state: number): () => number {
  let s = state >>> 0;
  return () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

/** A generator for one named stream of one seed. Same (seed, stream) → same sequence. */
export function createRng(seed: number, stream: string | number = 0): Rng {
  const mix = splitmix32((Math.trunc(seed) ^ hashString(String(stream))) >>> 0);
  let a = mix();
  let b = mix();
  let c = mix();
  let d = mix();
  const next = (): number => {
    // sfc32
    const t = (((a + b) >>> 0) + d) >>> 0;
    d = (d + 1) >>> 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) >>> 0;
    c = (c << 21) | (c >>> 11);
    c = (c + t) >>> 0;
    return t / 4294967296;
  };
  // Warm up: the first outputs of sfc32 are weakly mixed.
  for (let i = 0; i < 12; i += 1) next();

  let spare: number | undefined;
  return {
    next,
    uniform: (min, max) => min + (max - min) * next(),
    normal: () => {
      if (spare !== undefined) {
        const s = spare;
        spare = undefined;
        return s;
      }
      let u = 0;
      while (u <= Number.EPSILON) u = next();
      const v = next();
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(2 * Math.PI * v);
      return r * Math.cos(2 * Math.PI * v);
    },
    chance: (p) => next() < p,
    int: (n) => Math.floor(next() * n),
  };
}
