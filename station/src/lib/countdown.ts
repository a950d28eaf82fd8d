const two = (n: number) => String(n).padStart(2, '0');

/**
 * Time left as mm:ss, or h:mm:ss from an hour up (pot lives run to hours for slow systems).
 * Counted up to whole seconds so the last second still shows 00:01; never below 00:00.
 */
export function formatCountdown(seconds: number): string {
  const whole = Math.max(0, Math.ceil(seconds));
  const h = Math.floor(whole / 3600);
  const m = Math.floor((whole % 3600) / 60);
  const s = whole % 60;
  return h > 0 ? `${h}:${two(m)}:${two(s)}` : `${two(m)}:${two(s)}`;
}

/**
 * A wall-clock time as YYYY-MM-DD HH:mm in the bench's own time zone: unambiguous on a cup label
 * whatever the shop's locale.
 */
export function formatClock(time: Date): string {
  return `${time.getFullYear()}-${two(time.getMonth() + 1)}-${two(time.getDate())} ${two(time.getHours())}:${two(time.getMinutes())}`;
}
