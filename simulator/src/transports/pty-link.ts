import { spawn, type ChildProcess } from 'node:child_process';
import { rm } from 'node:fs/promises';
import { LineSplitter } from '@tareline/protocol';
import { SerialPort } from 'serialport';
import type { SimulatedScale } from '../simulated-scale.js';

export interface PtyLink {
  /** The path the hub opens with its serialport (a symbolic link to a /dev/pts device). */
  readonly path: string;
  close(): Promise<void>;
}

export class SocatMissingError extends Error {
  constructor() {
    super('socat was not found: install it with `apt-get install socat` (Debian/Ubuntu)');
    this.name = 'SocatMissingError';
  }
}

/** How long socat gets to make the pair before we give up. */
const SOCAT_READY_TIMEOUT_MS = 5000;

/**
 * The balance on a serial cable, for a hub on this machine: socat makes a pseudo-terminal
 * pair, the simulator opens one end with the real serialport bindings at `baud`, and the hub
 * opens the other (`path`). Unplugging closes the pair, so the hub's port fails as it would
 * when a cable is pulled; replugging makes a new pair under the same path.
 */
export async function openPty(
  scale: SimulatedScale,
  opts: { path: string; baud: number; onError?: (error: Error) => void },
): Promise<PtyLink> {
  const simPath = `${opts.path}.sim`;
  const report =
    opts.onError ?? ((error: Error) => process.stderr.write(`pty: ${error.message}\n`));
  let socat: ChildProcess | undefined;
  let port: SerialPort | undefined;
  let closing = false;

  const offLine = scale.onLine((line) => {
    if (port?.isOpen) port.write(`${line}\r\n`, 'latin1');
  });

  const startSocat = () =>
    new Promise<ChildProcess>((resolve, reject) => {
      const child = spawn(
        'socat',
        ['-d', '-d', `pty,raw,echo=0,link=${simPath}`, `pty,raw,echo=0,link=${opts.path}`],
        { stdio: ['ignore', 'ignore', 'pipe'] },
      );
      let log = '';
      const timer = setTimeout(() => {
        child.kill();
        reject(new Error(`socat did not start within ${SOCAT_READY_TIMEOUT_MS} ms: ${log.trim()}`));
      }, SOCAT_READY_TIMEOUT_MS);
      child.once('error', (error: NodeJS.ErrnoException) => {
        clearTimeout(timer);
        reject(error.code === 'ENOENT' ? new SocatMissingError() : error);
      });
      child.once('exit', (code) => {
        clearTimeout(timer);
        reject(new Error(`socat stopped (exit ${String(code)}): ${log.trim()}`));
      });
      child.stderr?.setEncoding('utf8');
      child.stderr?.on('data', (chunk: string) => {
        log = (log + chunk).slice(-2000);
        if (log.includes('starting data transfer loop')) {
          clearTimeout(timer);
          resolve(child);
        }
      });
    });

  const openPort = () =>
    new Promise<SerialPort>((resolve, reject) => {
      const next = new SerialPort({ path: simPath, baudRate: opts.baud, autoOpen: false });
      next.open((error) => (error ? reject(error) : resolve(next)));
    });

  const plugIn = async () => {
    const child = await startSocat();
    socat = child;
    child.on('exit', () => {
      if (socat !== child) return;
      // socat died without being asked (killed from outside): the cable is gone.
      socat = undefined;
      port?.close(() => undefined);
      port = undefined;
      if (!closing && scale.plugged) report(new Error('socat stopped; the pty pair is gone'));
    });
    const opened = await openPort();
    port = opened;
    const splitter = new LineSplitter({ maxLength: 64 });
    opened.setEncoding('latin1');
    opened.on('data', (chunk: string) => {
      for (const line of splitter.push(chunk)) scale.receive(line);
    });
    opened.on('error', (error) => report(error));
  };

  const pullOut = async () => {
    const closingPort = port;
    port = undefined;
    if (closingPort?.isOpen) {
      await new Promise<void>((resolve) => closingPort.close(() => resolve()));
    }
    const child = socat;
    socat = undefined;
    if (child && child.exitCode === null && child.signalCode === null) {
      const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
      child.kill('SIGTERM');
      await exited;
    }
    // socat removes its links on a clean exit; make sure no dangling link misleads the hub.
    await Promise.all([rm(simPath, { force: true }), rm(opts.path, { force: true })]);
  };

  // Changes run one after the other, so a quick unplug/replug cannot interleave.
  let changes = Promise.resolve();
  const change = (work: () => Promise<void>) => {
    changes = changes.then(work).catch((error: Error) => report(error));
    return changes;
  };
  const offPlug = scale.onPlug((plugged) => void change(plugged ? plugIn : pullOut));

  if (scale.plugged) {
    try {
      await plugIn();
    } catch (error) {
      offLine();
      offPlug();
      await pullOut();
      throw error;
    }
  }
  return {
    path: opts.path,
    async close() {
      closing = true;
      offLine();
      offPlug();
      await change(pullOut);
    },
  };
}
