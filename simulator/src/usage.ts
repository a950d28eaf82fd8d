/**
 * The simulator's command-line usage. The physical model and the transports arrive with the
 * scale-link work; until then the entry only explains itself.
 */
export const usage = `tareline-simulator — a virtual lab balance

Usage:
  npm run simulator -- [options]

Options:
  --help            show this text and exit

Planned (scale-link work): --pty, --tcp PORT, --format, --rate, --readability,
--capacity, --noise, --baud, --script FILE.
`;

export function parseArgs(argv: readonly string[]): { help: boolean; unknown: string[] } {
  const unknown = argv.filter((arg) => arg !== '--help' && arg !== '-h');
  return { help: argv.includes('--help') || argv.includes('-h'), unknown };
}
