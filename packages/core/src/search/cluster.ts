/** Anything with a time (s) and a loudness. */
export interface Clusterable {
  time: number;
  snr: number;
}

/**
 * Keeps each item that is the loudest within ±window seconds of itself (ties broken by input
 * order: the earlier item in `items` wins), across time and across the bank: one survivor per chirp.
 * Returns the survivors in time order. Common practice, no source.
 */
export function clusterByTime<T extends Clusterable>(items: readonly T[], windowSeconds: number): T[] {
  const order = items.map((_, i) => i).sort((a, b) => items[a].time - items[b].time || a - b);
  const keep: T[] = [];
  for (let p = 0; p < order.length; p++) {
    const it = items[order[p]];
    let loudest = true;
    for (let q = p - 1; q >= 0 && it.time - items[order[q]].time <= windowSeconds; q--) {
      const o = items[order[q]];
      if (o.snr > it.snr || (o.snr === it.snr && order[q] < order[p])) {
        loudest = false;
        break;
      }
    }
    if (!loudest) continue;
    for (let q = p + 1; q < order.length && items[order[q]].time - it.time <= windowSeconds; q++) {
      const o = items[order[q]];
      if (o.snr > it.snr || (o.snr === it.snr && order[q] < order[p])) {
        loudest = false;
        break;
      }
    }
    if (loudest) keep.push(it);
  }
  return keep;
}
