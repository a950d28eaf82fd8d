#!/usr/bin/env node
import { readFile } from 'node:fs/promises';
import {
  fieldErrors,
  getCodec,
  simulatorScriptSchema,
  type EncodableReading,
  type SimulatorStep,
} from '@tareline/protocol';
import { attachKeys } from './console-keys.js';
import { SimulatedScale, SimulatorStoppedError } from './simulated-scale.js';
import { openPty } from './transports/pty-link.js';
import { serveTcp } from './transports/tcp-adapter.js';
import { parseArgs, usage, type CliOptions } from './usage.js';

const SAMPLE_READING: EncodableReading = {
  grams: 1234.56,
  stable: true,
  mode: 'gross',
  unit: 'g',
  decimals: 2,
};

async function loadScript(file: string): Promise<SimulatorStep[]> {
  let json: unknown;
  try {
    json = JSON.parse(await readFile(file, 'utf8'));
  } catch (error) {
    throw new Error(`Cannot read the script ${file}: ${(error as Error).message}`, {
      cause: error,
    });
  }
  const parsed = simulatorScriptSchema.safeParse(json);
  if (!parsed.success) {
    const lines = fieldErrors(parsed.error).map((e) => `  step ${e.path}: ${e.message}`);
    throw new Error(`The script ${file} has bad steps:\n${lines.join('\n')}`);
  }
  return parsed.data;
}

async function run(options: CliOptions): Promise<void> {
  const script = options.script ? await loadScript(options.script) : undefined;
  const scale = new SimulatedScale(options.scale);
  const { format, rateHz, readabilityG, capacityG, unit } = scale.options;
  const say = (text: string) => process.stdout.write(`${text}\n`);
  say(
    `tareline-simulator: ${format} balance, d = ${readabilityG} g, max ${capacityG} g, ` +
      `${scale.options.continuous ? `${rateHz} lines/s` : 'prints on request'}, unit ${unit}`,
  );

  const closers: Array<() => Promise<void> | void> = [];
  let quitting = false;
  // A Ctrl-C reaches socat too, so errors while shutting down are expected and not reported.
  const report = (error: Error) => {
    if (!quitting) process.stderr.write(`${error.message}\n`);
  };
  if (options.pty && scale.options.continuous) {
    // A pty moves bytes at any speed; a real cable at `baud` carries ten bits a character (8N1).
    const lineChars = getCodec(format).encode(SAMPLE_READING).length + 2;
    const linesPerS = options.baud / (10 * lineChars);
    if (rateHz > linesPerS) {
      say(
        `note: at ${options.baud} baud a real cable carries only ${Math.floor(linesPerS)} such lines/s`,
      );
    }
  }
  if (options.pty) {
    const link = await openPty(scale, {
      path: options.ptyLink,
      baud: options.baud,
      onError: report,
    });
    closers.push(() => link.close());
    say(`pty: ${link.path}`);
    say(`hub: TARELINE_SCALE=serial://${link.path}?baud=${options.baud}&format=${format}`);
  } else if (options.tcpPort !== undefined) {
    const adapter = await serveTcp(scale, { port: options.tcpPort, host: options.host });
    closers.push(() => adapter.close());
    say(`tcp: ${options.host}:${adapter.port}`);
    say(`hub: TARELINE_SCALE=tcp://${options.host}:${adapter.port}?format=${format}`);
  } else {
    // No transport: the lines go to this terminal (or pipe).
    scale.onLine((line) => process.stdout.write(`${line}\n`));
  }

  const quit = async (code = 0) => {
    if (quitting) return;
    quitting = true;
    scale.stop();
    for (const close of closers.reverse()) await close();
    process.exit(code);
  };
  const quitLogged = (code = 0) => {
    quit(code).catch((error: Error) => {
      process.stderr.write(`${error.message}\n`);
      process.exit(1);
    });
  };
  process.on('SIGINT', () => quitLogged());
  process.on('SIGTERM', () => quitLogged());

  const interactive = process.stdin.isTTY && process.stdout.isTTY;
  if (interactive && (options.pty || options.tcpPort !== undefined)) {
    closers.push(attachKeys(scale, process.stdin, process.stdout, () => quitLogged()));
  }
  scale.start();

  if (script) {
    say(`script: ${script.length} steps`);
    try {
      await scale.runScript(script);
      say('script: done');
    } catch (error) {
      if (error instanceof SimulatorStoppedError) return;
      process.stderr.write(`script failed: ${(error as Error).message}\n`);
      await quit(1);
    }
  }
}

const parsed = parseArgs(process.argv.slice(2));
if (!parsed.ok) {
  process.stderr.write(`${parsed.errors.join('\n')}\n\n${usage}`);
  process.exitCode = 2;
} else if (parsed.options.help) {
  process.stdout.write(usage);
} else {
  run(parsed.options).catch((error: Error) => {
    process.stderr.write(`${error.message}\n`);
    process.exit(1);
  });
}
