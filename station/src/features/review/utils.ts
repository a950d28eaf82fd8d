/** A local date and time for the review tables, to the minute. */
export function shownTime(iso: string | null | undefined): string {
  if (!iso) return '\u2013';
  return new Date(iso).toLocaleString(undefined, {
    year: 'numeric',
    month: 'short',
    day: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
  });
}

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
