import { z } from 'zod';
import { scaleFormatSettingSchema, scaleUnitSchema } from './scale/types.js';
import { text } from './text.js';

/**
 * How the hub reaches a bench's scale, written as a URL so it fits in one setting
 * (`TARELINE_SCALE`, the bench's `scale_url` column):
 * - `serial:///dev/ttyUSB0?baud=9600&parity=none&dataBits=8&stopBits=1&rtscts=false&format=auto`
 *   (`serial://COM3?...` on Windows);
 * - `tcp://127.0.0.1:4001?format=auto` (a serial-to-network adapter);
 * - `sim://?format=headered&rateHz=20&noiseG=0.005&seed=7` (the simulator, in the hub's process).
 * Common to all: `readabilityG` (the scale interval d, in grams; otherwise read from the decimals
 * the scale prints) and `stabilityWindowS` (how long readings must stay within ± d to count as
 * stable when the format has no stability flag).
 */
export const SCALE_URL_EXAMPLES = [
  'serial:///dev/ttyUSB0?baud=9600&parity=none&dataBits=8&stopBits=1&rtscts=false&format=auto',
  'tcp://127.0.0.1:4001?format=auto',
  'sim://?format=headered',
] as const;

export const scaleTransportSchema = z.enum(['serial', 'tcp', 'simulated']);
export type ScaleTransportKind = z.infer<typeof scaleTransportSchema>;

/** Query values arrive as strings: these coerce them with a message an integrator understands. */
const numberParam = (what: string) =>
  z.coerce.number({ error: `${what} must be a number` }).refine(Number.isFinite, {
    message: `${what} must be a number`,
  });
const booleanParam = (what: string) =>
  z
    .enum(['true', 'false', '1', '0'], { error: `${what} must be true or false` })
    .transform((v) => v === 'true' || v === '1');

const commonParams = {
  format: scaleFormatSettingSchema.default('auto'),
  readabilityG: numberParam('readabilityG')
    .pipe(z.number().positive('readabilityG must be above 0').max(1000))
    .optional(),
  stabilityWindowS: numberParam('stabilityWindowS')
    .pipe(z.number().min(0.2, 'stabilityWindowS must be at least 0.2').max(30))
    .default(1),
};

export const serialLinkSchema = z.object({
  transport: z.literal('serial'),
  path: text().min(1, 'a serial port path is required, e.g. serial:///dev/ttyUSB0'),
  baudRate: numberParam('baud')
    .pipe(
      z
        .number()
        .int('baud must be a whole number')
        .min(1200, 'baud must be between 1200 and 115200')
        .max(115200, 'baud must be between 1200 and 115200'),
    )
    .default(9600),
  dataBits: z.coerce
    .number()
    .pipe(z.union([z.literal(7), z.literal(8)], { error: 'dataBits must be 7 or 8' }))
    .default(8),
  parity: z
    .enum(['none', 'even', 'odd'], { error: 'parity must be none, even or odd' })
    .default('none'),
  stopBits: z.coerce
    .number()
    .pipe(z.union([z.literal(1), z.literal(2)], { error: 'stopBits must be 1 or 2' }))
    .default(1),
  rtscts: booleanParam('rtscts').default(false),
  ...commonParams,
});

export const tcpLinkSchema = z.object({
  transport: z.literal('tcp'),
  host: text().min(1, 'a host is required, e.g. tcp://192.168.1.50:4001'),
  port: numberParam('port').pipe(
    z
      .number()
      .int('port must be a whole number')
      .min(1, 'port must be between 1 and 65535')
      .max(65535, 'port must be between 1 and 65535'),
  ),
  ...commonParams,
});

/** The in-process simulator's own settings (see the simulator's `SimulatorOptions`). */
export const simulatedScaleOptionsSchema = z.object({
  rateHz: numberParam('rateHz').pipe(z.number().positive().max(100)).optional(),
  readabilityG: numberParam('readabilityG').pipe(z.number().positive().max(1000)).optional(),
  capacityG: numberParam('capacityG').pipe(z.number().positive()).optional(),
  noiseG: numberParam('noiseG').pipe(z.number().nonnegative()).optional(),
  driftGPerMin: numberParam('driftGPerMin').optional(),
  unit: scaleUnitSchema.optional(),
  continuous: booleanParam('continuous').optional(),
  speed: numberParam('speed').pipe(z.number().positive().max(1000)).optional(),
  seed: numberParam('seed').pipe(z.number().int()).optional(),
});
export type SimulatedScaleOptions = z.infer<typeof simulatedScaleOptionsSchema>;

export const simulatedLinkSchema = z.object({
  transport: z.literal('simulated'),
  ...commonParams,
  /** The simulator prints this format; with `auto` it prints its default and the hub detects it. */
  simulator: simulatedScaleOptionsSchema,
});

export const scaleLinkSchema = z.discriminatedUnion('transport', [
  serialLinkSchema,
  tcpLinkSchema,
  simulatedLinkSchema,
]);
export type ScaleLinkSettings = z.infer<typeof scaleLinkSchema>;
export type SerialLinkSettings = z.infer<typeof serialLinkSchema>;
export type TcpLinkSettings = z.infer<typeof tcpLinkSchema>;
export type SimulatedLinkSettings = z.infer<typeof simulatedLinkSchema>;

/** A scale URL that cannot be used, with every problem named. */
export class ScaleUrlError extends Error {
  constructor(
    readonly url: string,
    readonly problems: readonly string[],
  ) {
    super(`Scale link "${url}" is not usable: ${problems.join('; ')}`);
    this.name = 'ScaleUrlError';
  }
}

const KNOWN_PARAMS: Record<ScaleTransportKind, readonly string[]> = {
  serial: [
    'baud',
    'dataBits',
    'parity',
    'stopBits',
    'rtscts',
    'format',
    'readabilityG',
    'stabilityWindowS',
  ],
  tcp: ['format', 'readabilityG', 'stabilityWindowS'],
  simulated: [
    'format',
    'readabilityG',
    'stabilityWindowS',
    ...Object.keys(simulatedScaleOptionsSchema.shape),
  ],
};

/**
 * Reads a scale URL into validated settings, or throws {@link ScaleUrlError} listing every
 * problem (unknown scheme, unknown or bad parameters). Pure: opens nothing.
 */
export function parseScaleUrl(url: string): ScaleLinkSettings {
  let parsed: URL;
  try {
    parsed = new URL(url.trim());
  } catch {
    throw new ScaleUrlError(url, [`not a URL; write it like ${SCALE_URL_EXAMPLES.join(' or ')}`]);
  }
  const scheme = parsed.protocol.replace(/:$/, '');
  const transport: ScaleTransportKind | undefined =
    scheme === 'serial'
      ? 'serial'
      : scheme === 'tcp'
        ? 'tcp'
        : scheme === 'sim'
          ? 'simulated'
          : undefined;
  if (!transport) {
    throw new ScaleUrlError(url, [`unknown scheme "${scheme}:"; use serial:, tcp: or sim:`]);
  }
  const params: Record<string, string> = {};
  const problems: string[] = [];
  for (const [key, value] of parsed.searchParams) {
    if (!KNOWN_PARAMS[transport].includes(key)) {
      problems.push(`unknown parameter "${key}" (known: ${KNOWN_PARAMS[transport].join(', ')})`);
    } else if (key in params) {
      problems.push(`parameter "${key}" given twice`);
    } else {
      params[key] = value;
    }
  }
  let candidate: Record<string, unknown>;
  const common = {
    format: params.format,
    readabilityG: params.readabilityG,
    stabilityWindowS: params.stabilityWindowS,
  };
  if (transport === 'serial') {
    // `serial:///dev/ttyUSB0` has the path in the pathname; `serial://COM3` in the host.
    const path = decodeURIComponent(`${parsed.host}${parsed.pathname}`);
    candidate = {
      transport,
      path,
      baudRate: params.baud,
      dataBits: params.dataBits,
      parity: params.parity,
      stopBits: params.stopBits,
      rtscts: params.rtscts,
      ...common,
    };
  } else if (transport === 'tcp') {
    if (parsed.pathname && parsed.pathname !== '/') {
      problems.push(`a tcp link has no path ("${parsed.pathname}"); write tcp://host:port`);
    }
    candidate = {
      transport,
      host: parsed.hostname.replace(/^\[|\]$/g, ''),
      port: parsed.port || undefined,
      ...common,
    };
  } else {
    const simulator: Record<string, string> = {};
    for (const key of Object.keys(simulatedScaleOptionsSchema.shape)) {
      if (params[key] !== undefined) simulator[key] = params[key];
    }
    candidate = { transport, ...common, simulator };
  }
  // Unset parameters must fall to the schema defaults, not fail as `undefined`.
  candidate = Object.fromEntries(Object.entries(candidate).filter(([, v]) => v !== undefined));
  if (transport === 'tcp' && candidate.port === undefined) {
    problems.push('a tcp link needs a port, e.g. tcp://127.0.0.1:4001');
  }
  const result = scaleLinkSchema.safeParse(candidate);
  if (!result.success) {
    for (const issue of result.error.issues) {
      const field = issue.path.at(-1);
      if (field === 'port' && candidate.port === undefined) continue;
      const name = field === 'baudRate' ? 'baud' : String(field ?? 'link');
      problems.push(issue.message.includes(name) ? issue.message : `${name}: ${issue.message}`);
    }
  }
  if (problems.length > 0 || !result.success) throw new ScaleUrlError(url, problems);
  return result.data;
}

/** A short description for logs and the benches page, e.g. `serial /dev/ttyUSB0 9600 8N1`. */
export function describeScaleLink(link: ScaleLinkSettings): string {
  switch (link.transport) {
    case 'serial':
      return `serial ${link.path} ${link.baudRate} ${link.dataBits}${link.parity[0]!.toUpperCase()}${link.stopBits}${link.rtscts ? ' RTS/CTS' : ''}`;
    case 'tcp':
      return `tcp ${link.host}:${link.port}`;
    case 'simulated':
      return 'simulated scale (in the hub)';
  }
}
