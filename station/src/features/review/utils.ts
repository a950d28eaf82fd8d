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
