import { useTheme } from '../../lib/theme';

/**
 * Switches the bench between its light and dark theme. One button, pressed while dark, so a
 * gloved hand needs no menu; the screen remembers the choice.
 */
export function ThemeToggle() {
  const [theme, setTheme] = useTheme();
  const dark = theme === 'dark';
  return (
    <button
      type="button"
      aria-pressed={dark}
      onClick={() => setTheme(dark ? 'light' : 'dark')}
      className="flex min-h-14 min-w-14 items-center gap-2 rounded-md px-3 text-lg font-semibold ring-2 ring-current/40 hover:bg-white/10"
    >
      <svg viewBox="0 0 24 24" aria-hidden="true" className="h-7 w-7">
        {dark ? (
          // A crescent moon: the dark theme is on.
          <path d="M20 14.5A8.5 8.5 0 0 1 9.5 4a8.5 8.5 0 1 0 10.5 10.5Z" fill="currentColor" />
        ) : (
          // A sun: the light theme is on.
          <g stroke="currentColor" strokeWidth="2" strokeLinecap="round">
            <circle cx="12" cy="12" r="4.5" fill="currentColor" />
            <path d="M12 2v2.5M12 19.5V22M2 12h2.5M19.5 12H22M4.9 4.9l1.8 1.8M17.3 17.3l1.8 1.8M4.9 19.1l1.8-1.8M17.3 6.7l1.8-1.8" />
          </g>
        )}
      </svg>
      Dark theme
    </button>
  );
}
