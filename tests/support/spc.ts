import jStat from 'jstat';

/** A seeded generator (mulberry32, common practice) so that statistical tests repeat exactly. */
export function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Normal draws by inversion through jstat, independent of the code under test. */
export function normalDraws(random: () => number, count: number, mean = 0, sd = 1): number[] {
  return Array.from({ length: count }, () =>
    jStat.normal.inv(Math.min(Math.max(random(), 1e-12), 1 - 1e-12), mean, sd),
  );
}
