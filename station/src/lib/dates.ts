/**
 * The one way Tareline shows a date: year-month-day and a 24-hour clock in the screen's own
 * time zone (`2026-12-04 14:05`). It reads the same in every language and sorts as text, so a
 * lead comparing the table, the batch page and the CSV (which is in UTC, ISO 8601) is not
 * misled by a locale's order of day and month.
 */

const pad = (n: number) => String(n).padStart(2, '0');
const NONE = '\u2013';

function parts(iso: string, utc: boolean) {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return null;
  return utc
    ? {
        y: d.getUTCFullYear(),
        mo: d.getUTCMonth() + 1,
        d: d.getUTCDate(),
        h: d.getUTCHours(),
        mi: d.getUTCMinutes(),
        s: d.getUTCSeconds(),
      }
    : {
        y: d.getFullYear(),
        mo: d.getMonth() + 1,
        d: d.getDate(),
        h: d.getHours(),
        mi: d.getMinutes(),
        s: d.getSeconds(),
      };
}

/** A day: `2026-12-04`. `utc` for figures the hub groups by UTC day or week. */
export function dayText(iso: string | null | undefined, options: { utc?: boolean } = {}): string {
  const p = iso ? parts(iso, options.utc ?? false) : null;
  return p ? `${p.y}-${pad(p.mo)}-${pad(p.d)}` : NONE;
}

/** A day and the time to the minute: `2026-12-04 14:05`. */
export function dateTimeText(iso: string | null | undefined): string {
  const p = iso ? parts(iso, false) : null;
  return p ? `${p.y}-${pad(p.mo)}-${pad(p.d)} ${pad(p.h)}:${pad(p.mi)}` : NONE;
}

/** The time of day to the second, for steps within one batch: `14:05:09`. */
export function clockText(iso: string | null | undefined): string {
  const p = iso ? parts(iso, false) : null;
  return p ? `${pad(p.h)}:${pad(p.mi)}:${pad(p.s)}` : NONE;
}
