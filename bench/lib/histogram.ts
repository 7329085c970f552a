/** A latency histogram in 0.1 ms steps up to 10 s, then 10 ms steps up to 120 s; mergeable across processes. */
const FINE_STEP_MS = 0.1;
const FINE_LIMIT_MS = 10_000;
const COARSE_STEP_MS = 10;
const COARSE_LIMIT_MS = 120_000;

export class Histogram {
  private counts = new Map<number, number>();
  count = 0;

  record(ms: number): void {
    this.counts.set(bucketOf(ms), (this.counts.get(bucketOf(ms)) ?? 0) + 1);
    this.count++;
  }

  merge(json: [number, number][]): void {
    for (const [bucket, n] of json) {
      this.counts.set(bucket, (this.counts.get(bucket) ?? 0) + n);
      this.count += n;
    }
  }

  toJSON(): [number, number][] {
    return [...this.counts.entries()];
  }

  /** The upper edge of the bucket holding the p-th percentile, ms. */
  percentile(p: number): number {
    if (this.count === 0) return NaN;
    const rank = Math.ceil((p / 100) * this.count);
    let seen = 0;
    for (const bucket of [...this.counts.keys()].sort((a, b) => a - b)) {
      seen += this.counts.get(bucket)!;
      if (seen >= rank) return upperEdge(bucket);
    }
    return upperEdge(Math.max(...this.counts.keys()));
  }
}

function bucketOf(ms: number): number {
  if (ms < FINE_LIMIT_MS) return Math.floor(ms / FINE_STEP_MS);
  const fineBuckets = FINE_LIMIT_MS / FINE_STEP_MS;
  return fineBuckets + Math.floor((Math.min(ms, COARSE_LIMIT_MS - 1) - FINE_LIMIT_MS) / COARSE_STEP_MS);
}

function upperEdge(bucket: number): number {
  const fineBuckets = FINE_LIMIT_MS / FINE_STEP_MS;
  if (bucket < fineBuckets) return Number(((bucket + 1) * FINE_STEP_MS).toFixed(1));
  return FINE_LIMIT_MS + (bucket - fineBuckets + 1) * COARSE_STEP_MS;
}

export function percentileOf(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
}
