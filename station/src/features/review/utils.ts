/** What went into the cup, all parts together; null before anything was poured. */
export function weighedTotalG(parts: readonly { actualG: number | null }[]): number | null {
  const poured = parts.filter((p) => p.actualG !== null);
  return poured.length ? poured.reduce((sum, p) => sum + p.actualG!, 0) : null;
}

/** Decisions in words, for the list, its filter and the batch page. */
export const DECISION_SHOWN = {
  release: 'Released',
  hold: 'On hold',
  scrap: 'Scrapped',
} as const;

/** What "worst" means on the accuracy page. */
export type WorstBy = 'p95' | 'goShare';

interface AccuracyLike {
  groupId: string;
  bucketStart: string;
  count: number;
  goShare: number;
  p95AbsDeviationPct: number | null;
}

/**
 * Groups worst first, each group's rows newest first. `p95`: by the largest 95th percentile of
 * |deviation| any of their days or weeks reached. `goShare`: by the lowest share of GO over all
 * their batches (each day or week weighted by its batch count).
 */
export function worstFirst<R extends AccuracyLike>(
  rows: readonly R[],
  by: WorstBy = 'p95',
): { groupId: string; worstP95: number | null; goShare: number; rows: R[] }[] {
  const groups = new Map<string, R[]>();
  for (const r of rows) groups.set(r.groupId, [...(groups.get(r.groupId) ?? []), r]);
  return [...groups]
    .map(([groupId, rs]) => {
      const p95s = rs.map((r) => r.p95AbsDeviationPct).filter((v): v is number => v !== null);
      const count = rs.reduce((n, r) => n + r.count, 0);
      return {
        groupId,
        worstP95: p95s.length ? Math.max(...p95s) : null,
        goShare: count ? rs.reduce((n, r) => n + r.goShare * r.count, 0) / count : 1,
        rows: [...rs].sort((a, b) => b.bucketStart.localeCompare(a.bucketStart)),
      };
    })
    .sort((a, b) =>
      by === 'goShare' ? a.goShare - b.goShare : (b.worstP95 ?? -1) - (a.worstP95 ?? -1),
    );
}
