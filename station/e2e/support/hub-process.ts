import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

const repoRoot = resolve(import.meta.dirname, '..', '..', '..');

export interface HubProcess {
  url: string;
  dataDir: string;
  output: () => string;
  stop: () => Promise<number | null>;
}

async function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const server = createServer();
    server.once('error', fail);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as { port: number };
      server.close(() => done(port));
    });
  });
}

/**
 * Starts the built hub (`npm run build` first) as its own process, the way `npm start` does,
 * with a fresh data folder, and waits until it says it is ready.
 */
export async function startBuiltHub(env: Record<string, string> = {}): Promise<HubProcess> {
  const dataDir = await mkdtemp(join(tmpdir(), 'tareline-e2e-'));
  const port = await freePort();
  const child: ChildProcess = spawn(process.execPath, [join(repoRoot, 'hub', 'dist', 'main.js')], {
    cwd: repoRoot,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      TARELINE_DATA_DIR: dataDir,
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout?.on('data', (chunk: Buffer) => (output += chunk.toString()));
  child.stderr?.on('data', (chunk: Buffer) => (output += chunk.toString()));
  const exited = new Promise<number | null>((done) => child.once('exit', (code) => done(code)));

  const deadline = Date.now() + 60_000;
  while (!output.includes('Tareline hub ready at')) {
    if (child.exitCode !== null) throw new Error(`hub exited with ${child.exitCode}:\n${output}`);
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`hub did not start within 60 s:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    url: `http://127.0.0.1:${port}`,
    dataDir,
    output: () => output,
    stop: async () => {
      if (child.exitCode === null) child.kill('SIGINT');
      const timer = setTimeout(() => child.kill('SIGKILL'), 15_000);
      const code = await exited;
      clearTimeout(timer);
      await rm(dataDir, { recursive: true, force: true });
      return code;
    },
  };
}
