/** A signed percentage with a true minus sign, e.g. "+0.71 %". */
export function signedPct(pct: number, decimals = 2): string {
  const text = pct.toFixed(decimals);
  if (Number(text) === 0) return `${(0).toFixed(decimals)} %`;
  return `${pct > 0 ? '+' : '\u2212'}${text.replace('-', '')} %`;
}

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
