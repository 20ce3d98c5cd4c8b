/** Order statistics for latency samples. */

/** The q-quantile (0 ≤ q ≤ 1) of the samples, by the nearest-rank method. */
export function quantile(samples: readonly number[], q: number): number {
  if (samples.length === 0) return Number.NaN;
  const sorted = [...samples].sort((a, b) => a - b);
  const rank = Math.max(1, Math.ceil(q * sorted.length));
  return sorted[rank - 1];
}

export const median = (samples: readonly number[]) => quantile(samples, 0.5);
export const p95 = (samples: readonly number[]) => quantile(samples, 0.95);

/** A small seeded generator (mulberry32), so every run builds the same inventory. */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
