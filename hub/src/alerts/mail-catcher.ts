import type { AddressInfo } from 'node:net';
import type { CaughtMail } from '@tareline/protocol';
import { SMTPServer, type SMTPServerAddress } from 'smtp-server';

/** Newest mails kept; older ones drop off (the catcher is for seeing alerts arrive, not an archive). */
const KEEP = 200;
const MAX_MESSAGE_BYTES = 2 * 1024 * 1024;

export interface MailCatcherOptions {
  /** Refuses a recipient with the server's words and code (a test's bad address). */
  refuse?: (address: string) => { code: number; message: string } | null;
}

/**
 * A small SMTP server on 127.0.0.1 that keeps what it receives in memory. With no mail server
 * configured the hub sends its alerts here, so `npm start` needs nothing set and an admin can
 * still see an alert arrive. Tests use it as the real server they send to.
 */
export class MailCatcher {
  private readonly caught: CaughtMail[] = [];
  private nextId = 1;
  private server: SMTPServer | undefined;
  private port = 0;

  constructor(private readonly options: MailCatcherOptions = {}) {}

  /** Listens on a free loopback port (or the given one, to come back where it was). */
  async start(port = 0): Promise<number> {
    const server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS', 'AUTH'],
      logger: false,
      size: MAX_MESSAGE_BYTES,
      onRcptTo: (address: SMTPServerAddress, _session, callback) => {
        const refusal = this.options.refuse?.(address.address);
        if (!refusal) return callback();
        const err = Object.assign(new Error(refusal.message), { responseCode: refusal.code });
        callback(err);
      },
      onData: (stream, session, callback) => {
        const chunks: Buffer[] = [];
        stream.on('data', (chunk: Buffer) => chunks.push(chunk));
        stream.on('end', () => {
          const raw = Buffer.concat(chunks).toString('utf8');
          this.keep({
            id: this.nextId++,
            receivedAt: new Date().toISOString(),
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: headerOf(raw, 'subject'),
            text: plainTextOf(raw),
            raw,
          });
          callback();
        });
      },
    });
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(port, '127.0.0.1', () => {
        server.off('error', reject);
        resolve();
      });
    });
    this.server = server;
    this.port = (server.server.address() as AddressInfo).port;
    return this.port;
  }

  get listeningPort(): number {
    return this.port;
  }

  async stop(): Promise<void> {
    const server = this.server;
    this.server = undefined;
    if (server) await new Promise<void>((resolve) => server.close(() => resolve()));
  }

  /** Caught mails, newest first. */
  list(): CaughtMail[] {
    return [...this.caught].reverse();
  }

  private keep(mail: CaughtMail): void {
    this.caught.push(mail);
    if (this.caught.length > KEEP) this.caught.shift();
  }
}

/** An unfolded header of a raw message, with RFC 2047 encoded words decoded. */
export function headerOf(raw: string, name: string): string {
  const head = raw.split(/\r?\n\r?\n/, 1)[0] ?? '';
  const unfolded = head.replace(/\r?\n[ \t]+/g, ' ');
  const line = unfolded.split(/\r?\n/).find((l) => l.toLowerCase().startsWith(`${name}:`));
  return line ? decodeWords(line.slice(name.length + 1).trim()) : '';
}

function decodeWords(value: string): string {
  return value
    .replace(/\?=\s+=\?/g, '?==?')
    .replace(
      /=\?([^?]+)\?([bBqQ])\?([^?]*)\?=/g,
      (_all, _charset: string, enc: string, data: string) =>
        enc.toUpperCase() === 'B'
          ? Buffer.from(data, 'base64').toString('utf8')
          : Buffer.from(
              data
                .replace(/_/g, ' ')
                .replace(/=([0-9A-Fa-f]{2})/g, (_m, hex: string) =>
                  String.fromCharCode(parseInt(hex, 16)),
                ),
              'latin1',
            ).toString('utf8'),
    );
}

/**
 * The text/plain part of a raw message, transfer encoding undone: the first part whose headers
 * say text/plain (or the whole body of a single-part message). Enough for the mails the hub
 * writes; not a general MIME parser.
 */
export function plainTextOf(raw: string): string {
  const parts = raw.split(/\r?\n--[^\r\n]+\r?\n/);
  const candidates = parts.length > 1 ? parts.slice(1) : [raw];
  for (const part of candidates) {
    const [head = '', ...rest] = part.split(/\r?\n\r?\n/);
    if (parts.length > 1 && !/content-type:\s*text\/plain/i.test(head)) continue;
    const body = rest.join('\r\n\r\n').replace(/\r?\n--[^\r\n]*--\s*$/, '');
    const encoding = /content-transfer-encoding:\s*([\w-]+)/i.exec(head)?.[1]?.toLowerCase();
    if (encoding === 'base64')
      return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8');
    if (encoding === 'quoted-printable') return decodeQuotedPrintable(body);
    return body;
  }
  return '';
}

function decodeQuotedPrintable(body: string): string {
  const bytes = body
    .replace(/=\r?\n/g, '')
    .replace(/=([0-9A-Fa-f]{2})/g, (_m, hex: string) => String.fromCharCode(parseInt(hex, 16)));
  return Buffer.from(bytes, 'latin1').toString('utf8');
}
