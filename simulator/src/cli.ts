#!/usr/bin/env node
import { readFile } from 'node:fs/promises';
import { fieldErrors, simulatorScriptSchema, type SimulatorStep } from '@tareline/protocol';
import { attachKeys } from './console-keys.js';
import { SimulatedScale, SimulatorStoppedError } from './simulated-scale.js';
import { openPty } from './transports/pty-link.js';
import { serveTcp } from './transports/tcp-adapter.js';
import { parseArgs, usage, type CliOptions } from './usage.js';

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
  if (options.pty) {
    const link = await openPty(scale, { path: options.ptyLink, baud: options.baud });
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

  let quitting = false;
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
