import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseArgs as parseNodeArgs } from 'node:util';
import { scaleFormatSchema, scaleUnitSchema } from '@tareline/protocol';
import type { SimulatorOptions } from './simulated-scale.js';

export const DEFAULT_PTY_LINK = join(tmpdir(), 'tareline-scale');
export const DEFAULT_BAUD = 9600;

export const usage = `tareline-simulator — a virtual lab balance

Usage:
  npm run simulator -- [options]

Where the balance is (pick one; without either it prints its lines here):
  --pty                 make a serial pseudo-terminal pair with socat and print the path the
                        hub opens (needs Debian's socat: apt-get install socat)
  --pty-link PATH       where that path is (default ${DEFAULT_PTY_LINK})
  --tcp PORT            act as a serial-to-network adapter on 127.0.0.1:PORT (0: any free port)
  --host ADDRESS        listen on another address than 127.0.0.1 with --tcp

How it behaves:
  --format NAME         headered, echo or plain (default headered)
  --rate HZ             lines a second while printing continuously (default 20)
  --readability G       scale interval d in grams (default 0.01)
  --capacity G          maximum load in grams (default 4000)
  --noise G             standard deviation of the noise in grams (default 0.4 d)
  --drift G_PER_MIN     slow drift of the zero point (default 0.005)
  --unit UNIT           g, kg, lb or oz (default g)
  --on-request          print only when asked (echo and headered formats)
  --baud N              baud rate of the pty end (default ${DEFAULT_BAUD}; 1200-115200)
  --seed N              same seed, same noise (default 1)
  --speed X             run simulated time X times faster (default 1)
  --script FILE         run a JSON list of steps, e.g.
                        [{"do":"place-cup","massG":40},{"do":"wait-for-tare"},
                         {"do":"pour","grams":100,"rateGPerS":8},{"do":"settle"}]
  --help                show this text and exit

Keys, in a terminal:
  a pour part A (100 g at 8 g/s)   b pour part B (30 g at 2 g/s)   s stop pouring
  t tare   l place, lift or return the cup   w place or lift a 200 g reference weight
  u unplug or replug   q quit
`;

export interface CliOptions {
  help: boolean;
  pty: boolean;
  ptyLink: string;
  tcpPort: number | undefined;
  host: string;
  baud: number;
  script: string | undefined;
  scale: Partial<SimulatorOptions>;
}

export type ParsedArgs = { ok: true; options: CliOptions } | { ok: false; errors: string[] };

const NUMBER_OPTIONS = {
  rate: 'rateHz',
  readability: 'readabilityG',
  capacity: 'capacityG',
  noise: 'noiseG',
  drift: 'driftGPerMin',
  seed: 'seed',
  speed: 'speed',
} as const satisfies Record<string, keyof SimulatorOptions>;

/** Read the command line. Every bad option is reported at once, each by name. */
export function parseArgs(argv: readonly string[]): ParsedArgs {
  let values: Record<string, string | boolean | undefined>;
  try {
    values = parseNodeArgs({
      args: [...argv],
      strict: true,
      allowPositionals: false,
      options: {
        help: { type: 'boolean', short: 'h' },
        pty: { type: 'boolean' },
        'pty-link': { type: 'string' },
        tcp: { type: 'string' },
        host: { type: 'string' },
        format: { type: 'string' },
        rate: { type: 'string' },
        readability: { type: 'string' },
        capacity: { type: 'string' },
        noise: { type: 'string' },
        drift: { type: 'string' },
        unit: { type: 'string' },
        'on-request': { type: 'boolean' },
        baud: { type: 'string' },
        seed: { type: 'string' },
        speed: { type: 'string' },
        script: { type: 'string' },
      },
    }).values;
  } catch (error) {
    return { ok: false, errors: [(error as Error).message] };
  }

  const errors: string[] = [];
  const scale: Partial<SimulatorOptions> = {};
  for (const [flag, key] of Object.entries(NUMBER_OPTIONS)) {
    const text = values[flag];
    if (typeof text !== 'string') continue;
    const value = Number(text);
    const mayBeZero = key === 'noiseG' || key === 'driftGPerMin' || key === 'seed';
    if (text.trim() === '' || !Number.isFinite(value) || value < 0 || (value === 0 && !mayBeZero)) {
      errors.push(
        `--${flag} must be a ${mayBeZero ? 'non-negative' : 'positive'} number, got "${text}"`,
      );
    } else {
      scale[key] = value;
    }
  }
  if (typeof values.format === 'string') {
    const format = scaleFormatSchema.safeParse(values.format);
    if (format.success) scale.format = format.data;
    else errors.push(`--format must be one of ${scaleFormatSchema.options.join(', ')}`);
  }
  if (typeof values.unit === 'string') {
    const unit = scaleUnitSchema.safeParse(values.unit);
    if (unit.success) scale.unit = unit.data;
    else errors.push(`--unit must be one of ${scaleUnitSchema.options.join(', ')}`);
  }
  if (values['on-request']) scale.continuous = false;

  const baud = values.baud === undefined ? DEFAULT_BAUD : Number(values.baud);
  if (!Number.isInteger(baud) || baud < 1200 || baud > 115200) {
    errors.push(`--baud must be a whole number from 1200 to 115200, got "${String(values.baud)}"`);
  }
  let tcpPort: number | undefined;
  if (typeof values.tcp === 'string') {
    tcpPort = Number(values.tcp);
    if (!Number.isInteger(tcpPort) || tcpPort < 0 || tcpPort > 65535) {
      errors.push(`--tcp must be a port number from 0 to 65535, got "${values.tcp}"`);
    }
  }
  if (values.pty && tcpPort !== undefined) errors.push('choose one of --pty and --tcp');

  if (errors.length > 0) return { ok: false, errors };
  return {
    ok: true,
    options: {
      help: values.help === true,
      pty: values.pty === true,
      ptyLink: typeof values['pty-link'] === 'string' ? values['pty-link'] : DEFAULT_PTY_LINK,
      tcpPort,
      host: typeof values.host === 'string' ? values.host : '127.0.0.1',
      baud,
      script: typeof values.script === 'string' ? values.script : undefined,
      scale,
    },
  };
}
