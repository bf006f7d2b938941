// A lot's values of one parameter in one ascending stream, merged from the wafers' sorted streams
// (k-way merge with a binary heap, O(N log k)) instead of sorting the lot again.

import type { Buffers } from './buffers';
import type { SortedColumn } from './sortedColumn';

export interface MergedStream {
  /** Ascending finite magnitudes of the whole lot. */
  sorted: Float64Array;
  site: Int32Array;
  /** Wafer of each entry (its index in the list given). */
  wafer: Uint16Array;
  /** Position of each entry in its wafer's stream. */
  position: Uint32Array;
}

/** Merges the parts; with `buffers` the result lives in reused scratch memory (read it before
 * the next merge). */
export function mergeSorted(parts: SortedColumn[], buffers?: Buffers): MergedStream {
  const total = parts.reduce((n, p) => n + p.sorted.length, 0);
  const sorted = buffers ? buffers.f64('merge.sorted', total) : new Float64Array(total);
  const site = buffers ? new Int32Array(buffers.u32('merge.site', total).buffer, 0, total) : new Int32Array(total);
  const wafer = buffers ? new Uint16Array(buffers.u32('merge.wafer', (total + 1) >> 1).buffer, 0, total) : new Uint16Array(total);
  const position = buffers ? buffers.u32('merge.position', total) : new Uint32Array(total);
  const at = new Int32Array(parts.length);
  const heapValue = new Float64Array(parts.length);
  const heapPart = new Int32Array(parts.length);
  let size = 0;
  const siftDown = (i: number) => {
    const v = heapValue[i];
    const p = heapPart[i];
    for (;;) {
      let child = 2 * i + 1;
      if (child >= size) break;
      if (child + 1 < size && heapValue[child + 1] < heapValue[child]) child++;
      if (heapValue[child] >= v) break;
      heapValue[i] = heapValue[child];
      heapPart[i] = heapPart[child];
      i = child;
    }
    heapValue[i] = v;
    heapPart[i] = p;
  };
  parts.forEach((part, p) => {
    if (part.sorted.length === 0) return;
    heapValue[size] = part.sorted[0];
    heapPart[size++] = p;
  });
  for (let i = (size >> 1) - 1; i >= 0; i--) siftDown(i);
  for (let k = 0; k < total; k++) {
    const p = heapPart[0];
    const part = parts[p];
    const j = at[p]++;
    sorted[k] = part.sorted[j];
    site[k] = part.site[j];
    wafer[k] = p;
    position[k] = j;
    if (j + 1 < part.sorted.length) {
      heapValue[0] = part.sorted[j + 1];
    } else {
      size--;
      heapValue[0] = heapValue[size];
      heapPart[0] = heapPart[size];
    }
    if (size > 0) siftDown(0);
  }
  return { sorted, site, wafer, position };
}
