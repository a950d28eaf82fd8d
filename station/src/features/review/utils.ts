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

/**
 * Groups worst first: by the largest 95th percentile of |deviation| any of their days or weeks
 * reached, each group's rows newest first.
 */
export function worstFirst<
  R extends { groupId: string; bucketStart: string; p95AbsDeviationPct: number | null },
>(rows: readonly R[]): { groupId: string; worstP95: number | null; rows: R[] }[] {
  const groups = new Map<string, R[]>();
  for (const r of rows) groups.set(r.groupId, [...(groups.get(r.groupId) ?? []), r]);
  return [...groups]
    .map(([groupId, rs]) => {
      const p95s = rs.map((r) => r.p95AbsDeviationPct).filter((v): v is number => v !== null);
      return {
        groupId,
        worstP95: p95s.length ? Math.max(...p95s) : null,
        rows: [...rs].sort((a, b) => b.bucketStart.localeCompare(a.bucketStart)),
      };
    })
    .sort((a, b) => (b.worstP95 ?? -1) - (a.worstP95 ?? -1));
}
