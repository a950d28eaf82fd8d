import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseScaleUrl, ScaleUrlError, type ScaleLinkSettings } from '@tareline/protocol';
import { z } from 'zod';

const hubRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Injection token of the validated {@link AppConfig}. */
export const APP_CONFIG = Symbol('APP_CONFIG');

export const LOG_LEVELS = ['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'] as const;
export type LogLevel = (typeof LOG_LEVELS)[number];

/** Settings of one hub process, read from the environment once at start-up. */
export interface AppConfig {
  version: string;
  http: { port: number; host: string };
  data: { dir: string };
  database: { url: string | undefined };
  log: { level: LogLevel };
  paths: { migrations: string; station: string };
  /** The scale link of the default bench `bench-1` (and of any bench without its own). */
  scale: { url: string; link: ScaleLinkSettings };
}

const portSchema = z.coerce
  .number({ error: 'must be a number' })
  .int('must be a whole number')
  .min(0, 'must be between 0 and 65535')
  .max(65535, 'must be between 0 and 65535');

const envSchema = z.object({
  PORT: portSchema.default(3000),
  HOST: z.string().min(1, 'must not be empty').default('0.0.0.0'),
  TARELINE_DATA_DIR: z.string().min(1, 'must not be empty').default('./data'),
  LOG_LEVEL: z
    .enum(LOG_LEVELS, { error: `must be one of ${LOG_LEVELS.join(', ')}` })
    .default('info'),
  DATABASE_URL: z
    .string()
    .refine((v) => v === '' || /^postgres(ql)?:\/\//.test(v), 'must start with postgres://')
    .optional(),
  TARELINE_STATION_DIR: z.string().min(1).optional(),
  TARELINE_SCALE: z
    .string()
    .default('sim://')
    .superRefine((url, ctx) => {
      try {
        parseScaleUrl(url);
      } catch (err) {
        if (!(err instanceof ScaleUrlError)) throw err;
        ctx.addIssue({ code: 'custom', message: err.problems.join('; ') });
      }
    }),
});

/** Every bad environment variable at once, so a start-up fails with one message to fix them all. */
export class ConfigError extends Error {
  constructor(readonly problems: readonly string[]) {
    super(
      `Tareline cannot start: bad configuration\n${problems.map((p) => `  - ${p}`).join('\n')}`,
    );
    this.name = 'ConfigError';
  }
}

function readVersion(): string {
  const pkg = JSON.parse(readFileSync(resolve(hubRoot, 'package.json'), 'utf8')) as {
    version: string;
  };
  return pkg.version;
}

/**
 * Validates the environment into an {@link AppConfig}. Empty strings count as unset so that
 * `PORT= npm start` behaves like `npm start`.
 */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): AppConfig {
  const present = Object.fromEntries(
    Object.entries(env).filter(([, value]) => value !== undefined && value !== ''),
  );
  const result = envSchema.safeParse(present);
  if (!result.success) {
    throw new ConfigError(
      result.error.issues.map((issue) => {
        const name = String(issue.path[0]);
        return `${name}=${JSON.stringify(env[name] ?? '')}: ${issue.message}`;
      }),
    );
  }
  const e = result.data;
  if (e.DATABASE_URL) {
    throw new ConfigError([
      'DATABASE_URL: a server PostgreSQL is not supported yet; unset it to use the embedded database',
    ]);
  }
  return {
    version: readVersion(),
    http: { port: e.PORT, host: e.HOST },
    data: { dir: resolve(e.TARELINE_DATA_DIR) },
    database: { url: e.DATABASE_URL },
    log: { level: e.LOG_LEVEL },
    paths: {
      migrations: resolve(hubRoot, '..', 'drizzle'),
      station: e.TARELINE_STATION_DIR
        ? resolve(e.TARELINE_STATION_DIR)
        : resolve(hubRoot, '..', 'station', 'dist'),
    },
    scale: { url: e.TARELINE_SCALE, link: parseScaleUrl(e.TARELINE_SCALE) },
  };
}
