import type { LoggerService } from '@nestjs/common';
import { pino, type Logger } from 'pino';
import type { LogLevel } from '../config/app-config.js';

/**
 * Nest's logger interface on top of pino, so every line the hub writes is one JSON object
 * (time, level, context, msg) that log shippers can read.
 */
export class PinoLogger implements LoggerService {
  readonly pino: Logger;

  constructor(level: LogLevel, destination?: pino.DestinationStream) {
    this.pino = pino(
      {
        level,
        base: { app: 'tareline-hub' },
        // Never let a secret reach a log line, whatever object a caller hands in.
        redact: {
          paths: ['password', 'pin', 'badge', 'token', '*.password', '*.pin', '*.badge', '*.token'],
          censor: '[redacted]',
        },
      },
      destination,
    );
  }

  log(message: unknown, ...rest: unknown[]): void {
    this.write('info', message, rest);
  }
  error(message: unknown, ...rest: unknown[]): void {
    this.write('error', message, rest);
  }
  warn(message: unknown, ...rest: unknown[]): void {
    this.write('warn', message, rest);
  }
  debug(message: unknown, ...rest: unknown[]): void {
    this.write('debug', message, rest);
  }
  verbose(message: unknown, ...rest: unknown[]): void {
    this.write('trace', message, rest);
  }
  fatal(message: unknown, ...rest: unknown[]): void {
    this.write('fatal', message, rest);
  }

  /** Nest passes the context (class name) last, and for errors a stack before it. */
  private write(level: pino.Level, message: unknown, rest: unknown[]): void {
    const context = typeof rest.at(-1) === 'string' ? (rest.at(-1) as string) : undefined;
    const extra = context === undefined ? rest : rest.slice(0, -1);
    const fields: Record<string, unknown> = {};
    if (context) fields.context = context;
    const stack = extra.find((item) => typeof item === 'string');
    if (stack) fields.stack = stack;
    if (message instanceof Error) {
      this.pino[level]({ ...fields, err: message }, message.message);
    } else if (typeof message === 'object' && message !== null) {
      this.pino[level]({ ...fields, ...(message as object) });
    } else {
      this.pino[level](fields, String(message));
    }
  }
}
