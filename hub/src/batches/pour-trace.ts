/**
 * The pour trace of a batch: every reading as [ms since the batch started, net g], stored
 * compactly as little-endian pairs of (uint32 ms, int32 net milligrams) — 8 bytes a reading, so
 * a two-minute batch at 20 readings a second takes about 19 kB. Milligrams keep every digit a
 * 0.001 g balance shows, up to ±2 147 kg.
 */
export const TRACE_BYTES_PER_POINT = 8;

export type TracePoint = [ms: number, netG: number];

export function encodeTrace(points: readonly TracePoint[]): Uint8Array {
  const bytes = new Uint8Array(points.length * TRACE_BYTES_PER_POINT);
  const view = new DataView(bytes.buffer);
  points.forEach(([ms, netG], i) => {
    const at = i * TRACE_BYTES_PER_POINT;
    view.setUint32(at, Math.max(0, Math.min(0xffffffff, Math.round(ms))), true);
    view.setInt32(
      at + 4,
      Math.max(-0x80000000, Math.min(0x7fffffff, Math.round(netG * 1000))),
      true,
    );
  });
  return bytes;
}

export function decodeTrace(bytes: Uint8Array | null | undefined): TracePoint[] {
  if (!bytes || bytes.byteLength === 0) return [];
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const count = Math.floor(bytes.byteLength / TRACE_BYTES_PER_POINT);
  const points: TracePoint[] = [];
  for (let i = 0; i < count; i++) {
    const at = i * TRACE_BYTES_PER_POINT;
    points.push([view.getUint32(at, true), view.getInt32(at + 4, true) / 1000]);
  }
  return points;
}
