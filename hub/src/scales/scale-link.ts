import { Logger } from '@nestjs/common';
import {
  CONFIRMING_LINES,
  detectFormat,
  getCodec,
  GRAMS_PER_UNIT,
  StabilityWindow,
  type ReadingEvent,
  type ScaleCodec,
  type ScaleLine,
  type ScaleLinkSettings,
  type ScaleState,
  type ScaleStatusEvent,
} from '@tareline/protocol';
import { LineFramer } from './line-framer.js';
import {
  toOpenError,
  TransportOpenError,
  type ScaleConnection,
  type ScaleTransport,
} from './transports/scale-transport.js';

export interface ScaleLinkTimings {
  /** No line for this long: `stale`. */
  staleAfterMs: number;
  /** First wait before opening again after a loss; doubles up to `maxBackoffMs`. */
  initialBackoffMs: number;
  maxBackoffMs: number;
  /** How long a tare or zero may take before it is reported as not done. */
  commandTimeoutMs: number;
  /** Lines gathered to recognise the format (`auto`) before telling the operator it fails. */
  detectLines: number;
  /** Unreadable lines in a row before the link reports an error (wrong baud rate, format). */
  unreadableBeforeError: number;
  /** The longest line accepted; anything longer is noise. */
  maxLineLength: number;
}

export const DEFAULT_LINK_TIMINGS: ScaleLinkTimings = {
  staleAfterMs: 2_000,
  initialBackoffMs: 250,
  // Short enough that a replugged scale is back within a few seconds.
  maxBackoffMs: 2_000,
  commandTimeoutMs: 5_000,
  detectLines: 20,
  unreadableBeforeError: 10,
  maxLineLength: 256,
};

/** A tare or zero that the scale cannot do now; the message says why in an operator's words. */
export class ScaleCommandError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ScaleCommandError';
  }
}

/** Readability used until the scale's printed decimals tell it (0.01 g: a common bench balance). */
const FALLBACK_READABILITY_G = 0.01;

type Listener<T> = (value: T) => void;

interface Waiter {
  done: (reading: ReadingEvent) => boolean;
  resolve: () => void;
  reject: (err: Error) => void;
  timer: NodeJS.Timeout;
}

/**
 * The hub's link to one bench's scale: opens the transport, frames and decodes lines, keeps the
 * state (`connecting`, `online`, `stale`, `offline`, `error`), reconnects with backoff forever,
 * judges stability where the format does not, and applies tare and zero — the scale's command
 * where its codec has one, otherwise a software tare kept here.
 */
export class ScaleLink {
  private readonly logger: Logger;
  private readonly timings: ScaleLinkTimings;
  private readonly readingListeners = new Set<Listener<ReadingEvent>>();
  private readonly statusListeners = new Set<Listener<ScaleStatusEvent>>();
  private current: ScaleStatusEvent;
  private last: ReadingEvent | undefined;
  /** What the last weight line said it shows. */
  private lastLineMode: 'gross' | 'net' | 'unknown' = 'unknown';
  private seq = 0;

  private running = false;
  private loop: Promise<void> | undefined;
  private connection: ScaleConnection | undefined;
  private endConnection: ((reason: string) => void) | undefined;
  private sleepTimer: NodeJS.Timeout | undefined;
  private wake: (() => void) | undefined;
  private staleTimer: NodeJS.Timeout | undefined;
  private attempt = 0;

  private codec: ScaleCodec | undefined;
  /** Set on every opening: the first line may be the tail of one the port was opened into. */
  private dropNextLine = false;
  /** `auto`: the latest lines, to recognise the family and to notice when it changes. */
  private recentLines: string[] = [];
  private unrecognisedLines = 0;
  private unreadableStreak = 0;
  private detectedReadabilityG: number | undefined;
  private stability: StabilityWindow | undefined;
  private stabilityToleranceG = 0;
  /** The tare the scale itself holds (from its tare reply), to tell gross from net. */
  private scaleTareG = 0;
  /** Gross when a tare command was sent, for families that print no tare value (lines turn net). */
  private grossAtTareCommandG: number | undefined;
  /** Tare and zero kept by the hub for scales that have no such command. */
  private softTareG = 0;
  private softZeroG = 0;
  private readonly waiters = new Set<Waiter>();
  private readonly refusalListeners = new Set<(line: ScaleLine) => void>();

  constructor(
    readonly benchId: string,
    readonly settings: ScaleLinkSettings,
    readonly transport: ScaleTransport,
    timings: Partial<ScaleLinkTimings> = {},
  ) {
    this.timings = { ...DEFAULT_LINK_TIMINGS, ...timings };
    this.logger = new Logger(`Scale ${benchId}`);
    this.current = {
      benchId,
      state: 'connecting',
      detail: `not opened yet: ${transport.description}`,
    };
  }

  // ---- reading the state --------------------------------------------------------------------

  status(): ScaleStatusEvent {
    return this.current;
  }

  latest(): ReadingEvent | undefined {
    return this.last;
  }

  /**
   * What the latest reading is measured from: the mode its line stated, and whether the hub's
   * tare is its own (the line family takes no tare command), so a restart can tell a balance
   * that kept its tare from one that lost it.
   */
  frame(): { lineMode: 'gross' | 'net' | 'unknown'; softwareTare: boolean } {
    return {
      lineMode: this.lastLineMode,
      softwareTare: this.codec !== undefined && this.codec.command('tare') === undefined,
    };
  }

  /** The scale interval d in grams: configured, else read from the scale's printed decimals. */
  readabilityG(): number {
    return this.settings.readabilityG ?? this.detectedReadabilityG ?? FALLBACK_READABILITY_G;
  }

  onReading(listener: Listener<ReadingEvent>): () => void {
    this.readingListeners.add(listener);
    return () => this.readingListeners.delete(listener);
  }

  onStatus(listener: Listener<ScaleStatusEvent>): () => void {
    this.statusListeners.add(listener);
    return () => this.statusListeners.delete(listener);
  }

  // ---- life cycle ---------------------------------------------------------------------------

  start(): void {
    if (this.running) return;
    this.running = true;
    this.loop = this.connectLoop().catch((err: unknown) => {
      // The loop handles every failure of the transport itself; reaching here is a bug.
      this.logger.error(err instanceof Error ? err : String(err));
      this.setState('error', `the scale link stopped: ${(err as Error)?.message ?? String(err)}`);
    });
  }

  /** Closes the port and frees every timer; the link can be dropped afterwards. */
  async stop(): Promise<void> {
    this.running = false;
    this.wake?.();
    this.endConnection?.('the hub is stopping');
    await this.loop;
    for (const waiter of this.waiters) {
      clearTimeout(waiter.timer);
      waiter.reject(new ScaleCommandError('The hub is stopping'));
    }
    this.waiters.clear();
    await this.transport.dispose();
    this.setState('offline', 'the hub stopped reading this scale');
  }

  private async connectLoop(): Promise<void> {
    while (this.running) {
      this.setState('connecting', `opening ${this.transport.description}`);
      let connection: ScaleConnection;
      try {
        connection = await this.transport.open();
      } catch (err) {
        const failure =
          err instanceof TransportOpenError ? err : toOpenError(err, this.transport.description);
        const delay = this.nextDelay();
        this.setState(
          failure.absent ? 'offline' : 'error',
          `${failure.message}; trying again in ${(delay / 1000).toFixed(1)} s`,
        );
        await this.sleep(delay);
        continue;
      }
      if (!this.running) {
        await connection.close();
        break;
      }
      const reason = await this.read(connection);
      if (!this.running) break;
      const delay = this.nextDelay();
      this.setState('offline', `${reason}; trying again in ${(delay / 1000).toFixed(1)} s`);
      await this.sleep(delay);
    }
  }

  private nextDelay(): number {
    const delay = Math.min(
      this.timings.maxBackoffMs,
      this.timings.initialBackoffMs * 2 ** this.attempt,
    );
    this.attempt += 1;
    return delay;
  }

  private sleep(ms: number): Promise<void> {
    if (!this.running) return Promise.resolve();
    return new Promise((resolve) => {
      this.wake = () => {
        clearTimeout(this.sleepTimer);
        this.wake = undefined;
        resolve();
      };
      this.sleepTimer = setTimeout(() => this.wake?.(), ms);
    });
  }

  /** Reads one open connection until it is lost; resolves with why, after it is closed. */
  private read(connection: ScaleConnection): Promise<string> {
    this.connection = connection;
    this.codec = this.settings.format === 'auto' ? undefined : getCodec(this.settings.format);
    this.dropNextLine = true;
    this.recentLines = [];
    this.unrecognisedLines = 0;
    this.unreadableStreak = 0;
    this.stability = undefined;
    this.setState(
      'connecting',
      `${this.transport.description} open, waiting for the first line` +
        (this.codec ? '' : ' to recognise the format'),
    );
    this.armStaleTimer();
    const { stream } = connection;
    const framer = new LineFramer({ maxLength: this.timings.maxLineLength });
    return new Promise<string>((resolve) => {
      let ended = false;
      const end = (reason: string) => {
        if (ended) return;
        ended = true;
        clearTimeout(this.staleTimer);
        this.staleTimer = undefined;
        stream.off('close', onClose);
        stream.off('error', onError);
        stream.off('end', onEnd);
        stream.unpipe(framer);
        framer.destroy();
        this.connection = undefined;
        this.endConnection = undefined;
        void connection.close().then(() => resolve(reason));
      };
      const onClose = (err?: Error | boolean | null) =>
        end(err instanceof Error ? `connection lost: ${err.message}` : 'the port was closed');
      const onError = (err: Error) => end(`connection lost: ${err.message}`);
      const onEnd = () => end('the other end closed the connection');
      this.endConnection = end;
      stream.on('close', onClose);
      stream.on('error', onError);
      stream.on('end', onEnd);
      framer.on('data', (line: string) => this.handleLine(line));
      framer.on('error', (err: Error) => end(`line framing failed: ${err.message}`));
      stream.pipe(framer);
    });
  }

  private armStaleTimer(): void {
    if (this.staleTimer) {
      this.staleTimer.refresh();
      return;
    }
    this.staleTimer = setTimeout(() => {
      const seconds = this.timings.staleAfterMs / 1000;
      this.setState(
        'stale',
        this.current.state === 'online' || this.current.state === 'stale'
          ? `no line from the scale for ${seconds} s`
          : `${this.transport.description} is open but the scale printed nothing for ${seconds} s ` +
              '(is it switched on and set to print continuously?)',
      );
      this.checkStillThere();
    }, this.timings.staleAfterMs);
  }

  /** Quiet: if the device itself has gone, end the connection so the link reopens it. */
  private checkStillThere(): void {
    const stillThere = this.transport.stillThere;
    if (!stillThere) return;
    stillThere.call(this.transport).then(
      (there) => {
        if (!there) this.endConnection?.('the port has gone (unplugged?)');
        // Still there but quiet: look again after another quiet spell.
        else this.staleTimer?.refresh();
      },
      () => this.staleTimer?.refresh(),
    );
  }

  // ---- lines --------------------------------------------------------------------------------

  private handleLine(raw: string): void {
    const t = Date.now();
    this.armStaleTimer();
    if (this.dropNextLine) {
      // Opening a port mid-line gives the tail of a line, and a tail can read as a smaller
      // weight (`23.45 g` from `+    123.45 g`): never trust the first line.
      this.dropNextLine = false;
      return;
    }
    if (this.settings.format === 'auto' && !this.recognise(raw)) return;
    const line = this.codec!.parse(raw);
    if (line.kind === 'unreadable') {
      this.unreadableStreak += 1;
      if (this.unreadableStreak === this.timings.unreadableBeforeError) {
        this.setState(
          'error',
          `${this.unreadableStreak} lines in a row are not ${this.codec!.format} lines, e.g. ` +
            `${JSON.stringify(raw.slice(0, 40))} (check the format, baud rate and parity)`,
        );
      }
      return;
    }
    this.unreadableStreak = 0;
    if (this.current.state !== 'online') this.attempt = 0;
    this.setState(
      'online',
      `${this.transport.description}, ${this.codec!.format} lines` +
        (this.settings.format === 'auto' ? ' (recognised)' : ''),
    );
    switch (line.kind) {
      case 'weight':
        if (line.tare) {
          this.scaleTareG = line.grams;
          this.grossAtTareCommandG = undefined;
          return;
        }
        this.acceptWeight(t, line);
        return;
      case 'overload':
      case 'underload':
        this.publish({
          benchId: this.benchId,
          seq: this.seq++,
          t,
          grossG: this.last?.grossG ?? 0,
          netG: this.last?.netG ?? 0,
          stable: false,
          outOfRange: line.kind,
        });
        return;
      case 'refused':
        for (const listener of this.refusalListeners) listener(line);
        return;
      case 'busy':
      case 'ack':
        return;
    }
  }

  /**
   * Auto format: whether `raw` is to be read with {@link codec}. Until protocol confirms a family
   * nothing is read; afterwards every line the family does not read is a reason to look again,
   * so a wrong start (or a balance switched to another format) does not hold the link in error.
   */
  private recognise(raw: string): boolean {
    this.recentLines.push(raw);
    if (this.recentLines.length > CONFIRMING_LINES) this.recentLines.shift();
    if (this.codec && this.codec.parse(raw).kind !== 'unreadable') return true;
    const format = detectFormat(this.recentLines);
    if (format && format !== this.codec?.format) {
      if (this.codec) this.logger.warn(`the lines changed from ${this.codec.format} to ${format}`);
      else this.logger.log(`recognised ${format} lines`);
      this.codec = getCodec(format);
      // What the other family's lines said about tare and stability means nothing now.
      this.stability = undefined;
      this.scaleTareG = 0;
      this.grossAtTareCommandG = undefined;
      this.unrecognisedLines = 0;
      return true;
    }
    // A family is known: its unreadable lines count towards the link's error as usual.
    if (this.codec) return true;
    this.unrecognisedLines += 1;
    if (this.unrecognisedLines === this.timings.detectLines) {
      this.setState(
        'error',
        `${this.timings.detectLines} lines and none in a known format, e.g. ` +
          `${JSON.stringify(raw.slice(0, 40))} (check the baud rate and parity, or set the format)`,
      );
    }
    return false;
  }

  private acceptWeight(t: number, line: Extract<ScaleLine, { kind: 'weight' }>): void {
    this.learnReadability(line);
    this.lastLineMode = line.mode;
    let grossG: number;
    let netG: number;
    if (line.mode === 'gross') {
      // The scale says this is gross: whatever tare it held is gone.
      this.scaleTareG = 0;
      grossG = line.grams - this.softZeroG;
      netG = grossG - this.softTareG;
    } else {
      if (line.mode === 'net' && this.grossAtTareCommandG !== undefined) {
        if (this.scaleTareG === 0) this.scaleTareG = this.grossAtTareCommandG;
        this.grossAtTareCommandG = undefined;
      }
      // Net of the scale's own tare (or a format that does not say, which shows its display).
      netG = line.grams - this.softZeroG - this.softTareG;
      grossG = line.grams - this.softZeroG + this.scaleTareG;
    }
    const stable = line.stable ?? this.judgeStability(t, grossG);
    this.publish({
      benchId: this.benchId,
      seq: this.seq++,
      t,
      grossG: round(grossG),
      netG: round(netG),
      stable,
    });
  }

  private learnReadability(line: Extract<ScaleLine, { kind: 'weight' }>): void {
    if (this.settings.readabilityG !== undefined) return;
    const digits = /[-+]?\d*\.?\d+/.exec(line.raw)?.[0];
    if (!digits) return;
    const decimals = digits.includes('.') ? digits.length - digits.indexOf('.') - 1 : 0;
    this.detectedReadabilityG = round(10 ** -decimals * GRAMS_PER_UNIT[line.unit]);
  }

  private judgeStability(t: number, grossG: number): boolean {
    const d = this.readabilityG();
    if (!this.stability || this.stabilityToleranceG !== d) {
      this.stability = new StabilityWindow(this.settings.stabilityWindowS * 1000, d);
      this.stabilityToleranceG = d;
    }
    return this.stability.push(t, grossG);
  }

  private publish(reading: ReadingEvent): void {
    this.last = reading;
    for (const waiter of [...this.waiters]) {
      if (waiter.done(reading)) {
        clearTimeout(waiter.timer);
        this.waiters.delete(waiter);
        waiter.resolve();
      }
    }
    for (const listener of this.readingListeners) listener(reading);
  }

  private setState(state: ScaleState, rawDetail: string): void {
    // The bench screen and the status event get words; the hub's log keeps the device and the
    // system's own message for whoever wires the scale.
    const detail = scaleDetailInWords(rawDetail);
    if (state === this.current.state && detail === this.current.detail) return;
    const previous = this.current.state;
    this.current = { benchId: this.benchId, state, detail };
    if (state !== previous) {
      const log = state === 'error' ? 'warn' : 'log';
      this.logger[log](`${state}: ${rawDetail}`);
    }
    for (const listener of this.statusListeners) listener(this.current);
  }

  // ---- tare and zero ------------------------------------------------------------------------

  /** Tares: resolves once a reading shows net ≈ 0 (within 2 d). */
  tare(): Promise<void> {
    return this.zeroOrTare('tare');
  }

  /** Zeroes the empty pan: resolves once a reading shows gross ≈ 0 (within 2 d). */
  zero(): Promise<void> {
    return this.zeroOrTare('zero');
  }

  private async zeroOrTare(what: 'tare' | 'zero'): Promise<void> {
    const { state, detail } = this.current;
    if (state !== 'online' || !this.codec || !this.connection) {
      throw new ScaleCommandError(`Cannot ${what}: the scale is ${state} (${detail})`);
    }
    const settled = (r: ReadingEvent) =>
      !r.outOfRange &&
      Math.abs(what === 'tare' ? r.netG : r.grossG) <= 2 * this.readabilityG() + 1e-9;
    const software = () => {
      const reading = this.last;
      if (!reading || reading.outOfRange) {
        throw new ScaleCommandError(`Cannot ${what}: no valid reading from the scale yet`);
      }
      if (what === 'tare') {
        this.softTareG = reading.grossG;
      } else {
        this.softZeroG += reading.grossG;
        this.softTareG = 0;
      }
    };
    const commandLine = this.codec.command(what);
    if (commandLine === undefined) {
      software();
      await this.waitFor(settled, what);
      return;
    }
    if (what === 'tare') {
      this.scaleTareG = 0;
      this.grossAtTareCommandG = this.last?.outOfRange ? undefined : this.last?.grossG;
    }
    // The scale holds the tare (or the zero) from now on; a software one on top would count twice.
    const { softTareG, softZeroG } = this;
    this.softTareG = 0;
    if (what === 'zero') this.softZeroG = 0;
    await new Promise<void>((resolve, reject) => {
      const onRefused = () => {
        this.refusalListeners.delete(onRefused);
        this.logger.warn(`the scale refused the ${what} command; keeping a software ${what}`);
        this.softTareG = softTareG;
        this.softZeroG = softZeroG;
        this.grossAtTareCommandG = undefined;
        // Synchronously, so the very next line is already read with the software tare.
        try {
          software();
        } catch (err) {
          for (const waiter of this.waiters) {
            if (waiter.resolve === onSettled) {
              clearTimeout(waiter.timer);
              this.waiters.delete(waiter);
            }
          }
          reject(err as Error);
        }
      };
      const onSettled = () => {
        this.refusalListeners.delete(onRefused);
        resolve();
      };
      this.refusalListeners.add(onRefused);
      this.addWaiter(settled, what, onSettled, (err) => {
        this.refusalListeners.delete(onRefused);
        reject(err);
      });
      this.connection!.stream.write(`${commandLine}\r\n`);
    });
  }

  private waitFor(settled: (r: ReadingEvent) => boolean, what: string): Promise<void> {
    return new Promise((resolve, reject) => this.addWaiter(settled, what, resolve, reject));
  }

  private addWaiter(
    done: (r: ReadingEvent) => boolean,
    what: string,
    resolve: () => void,
    reject: (err: Error) => void,
  ): void {
    const waiter: Waiter = {
      done,
      resolve,
      reject,
      timer: setTimeout(() => {
        this.waiters.delete(waiter);
        const shown = this.last ? ` (net ${this.last.netG} g)` : '';
        reject(
          new ScaleCommandError(
            `The scale did not settle at zero within ${this.timings.commandTimeoutMs / 1000} s ` +
              `after ${what}${shown}; keep the pan still and try again`,
          ),
        );
      }, this.timings.commandTimeoutMs),
    };
    this.waiters.add(waiter);
  }
}

/** Drops floating-point dust (0.1 + 0.2) without touching any printed digit. */
function round(grams: number): number {
  return Math.round(grams * 1e6) / 1e6;
}

/** What a system error code means at a bench, in words (errno names as Node.js reports them). */
const CODE_WORDS: Record<string, string> = {
  ENOENT: 'the scale is not connected: check that its cable is plugged in',
  ENODEV: 'the scale is not connected: check that its cable is plugged in',
  ENXIO: 'the scale is not connected: check that its cable is plugged in',
  EIO: 'the scale stopped answering: its cable was pulled or it was switched off',
  EACCES: 'the hub is not allowed to open the scale port: ask an admin',
  EPERM: 'the hub is not allowed to open the scale port: ask an admin',
  EBUSY: 'another program is using the scale port',
  ECONNREFUSED: "nothing answers at the scale's network address",
  EHOSTUNREACH: "the scale's network address cannot be reached",
  ENETUNREACH: "the scale's network address cannot be reached",
  ECONNRESET: 'the scale closed the network connection',
  ETIMEDOUT: 'the scale did not answer in time',
};

/**
 * A scale state's detail as an operator reads it: system error codes told in words, and no
 * device paths (`/dev/ttyUSB0`, `COM3`, a pseudo-terminal's path) or network addresses.
 */
export function scaleDetailInWords(detail: string): string {
  const known = new RegExp(
    `(?:Error:\\s*)?(?:connect\\s+)?\\b(${Object.keys(CODE_WORDS).join('|')})\\b(?::[^;]*|\\s+[\\w.:-]+)?`,
    'g',
  );
  return (
    detail
      // "Error: ENOENT: no such file or directory, cannot open /dev/ttyUSB0" and the like.
      .replace(known, (_m, code: string) => CODE_WORDS[code]!)
      .replace(/(?:Error:\s*)?\bE[A-Z]{3,}:[^;]*/g, 'the system refused the scale port')
      .replace(/(?:Error:\s*)?No such file or directory[^;]*/gi, CODE_WORDS.ENOENT!)
      // The link's own description: `serial /dev/ttyUSB0 9600 8N1`, `tcp 10.0.0.7:4001`.
      .replace(/\bserial \S+(?: \d+ \d[NEOMS]\d(?: RTS\/CTS)?)?/g, 'the serial port')
      .replace(/\btcp [\w.-]+:\d+/g, 'the network link')
      .replace(/(?:\/dev\/|\/tmp\/|\\\\\.\\)[^\s,;:)]+/g, 'the scale port')
      .replace(/\bCOM\d+\b/g, 'the scale port')
      .replace(/\b\d{1,3}(?:\.\d{1,3}){3}(?::\d+)?\b/g, "the scale's address")
  );
}
