import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { connect } from 'node:net';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { getCodec, LineSplitter } from '@tareline/protocol';
import { afterEach, describe, expect, it } from 'vitest';

const workspace = dirname(dirname(fileURLToPath(import.meta.url)));
const children: ChildProcess[] = [];
const folders: string[] = [];
afterEach(async () => {
  for (const child of children.splice(0)) child.kill('SIGTERM');
  for (const folder of folders.splice(0)) await rm(folder, { recursive: true, force: true });
});

function startCli(args: string[]) {
  const child = spawn(
    process.execPath,
    ['--import', 'tsx', '--conditions=@tareline/source', 'src/cli.ts', ...args],
    { cwd: workspace, stdio: ['ignore', 'pipe', 'pipe'] },
  );
  children.push(child);
  let out = '';
  let err = '';
  child.stdout.setEncoding('utf8').on('data', (chunk: string) => (out += chunk));
  child.stderr.setEncoding('utf8').on('data', (chunk: string) => (err += chunk));
  const exited = new Promise<number | null>((resolve) => child.once('exit', resolve));
  const waitFor = async (pattern: RegExp): Promise<RegExpMatchArray> => {
    for (let i = 0; i < 300; i++) {
      const match = out.match(pattern);
      if (match) return match;
      if (child.exitCode !== null) break;
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
    throw new Error(`no ${String(pattern)} in output:\n${out}\n${err}`);
  };
  return { child, exited, waitFor, output: () => out, errors: () => err };
}

describe('simulator CLI', () => {
  it('serves a scripted pour on a TCP port and prints the hub setting', async () => {
    const folder = await mkdtemp(join(tmpdir(), 'tareline-cli-'));
    folders.push(folder);
    const script = join(folder, 'pour.json');
    await writeFile(
      script,
      JSON.stringify([
        { do: 'place-cup', massG: 40 },
        { do: 'tare' },
        { do: 'pour', grams: 20, rateGPerS: 10 },
        { do: 'settle' },
      ]),
    );
    const cli = startCli(['--tcp', '0', '--format', 'plain', '--speed', '4', '--script', script]);
    const [, port] = await cli.waitFor(/tcp: 127\.0\.0\.1:(\d+)/);
    expect(cli.output()).toContain(`TARELINE_SCALE=tcp://127.0.0.1:${port}?format=plain`);

    const socket = connect({ port: Number(port), host: '127.0.0.1' });
    const splitter = new LineSplitter();
    const lines: string[] = [];
    socket.setEncoding('latin1').on('data', (chunk: string) => lines.push(...splitter.push(chunk)));
    await cli.waitFor(/script: done/);
    await new Promise((resolve) => setTimeout(resolve, 100));
    socket.destroy();
    const codec = getCodec('plain');
    const last = codec.parse(lines.at(-1)!);
    expect(last).toMatchObject({ kind: 'weight', stable: true });
    expect(last.kind === 'weight' && Math.abs(last.grams - 20)).toBeLessThanOrEqual(0.03);
  }, 20_000);

  it('refuses a bad script with the step and field named, and exits', async () => {
    const folder = await mkdtemp(join(tmpdir(), 'tareline-cli-'));
    folders.push(folder);
    const script = join(folder, 'bad.json');
    await writeFile(script, JSON.stringify([{ do: 'place-cup', massG: 40 }, { do: 'pour' }]));
    const cli = startCli(['--tcp', '0', '--script', script]);
    expect(await cli.exited).toBe(1);
    expect(cli.errors()).toMatch(/step 1\.grams/);
  }, 20_000);

  it('exits with usage on a bad option', async () => {
    const cli = startCli(['--format', 'morse']);
    expect(await cli.exited).toBe(2);
    expect(cli.errors()).toContain('--format must be one of headered, echo, plain');
  }, 20_000);
});
