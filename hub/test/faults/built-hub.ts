import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { join, resolve } from 'node:path';

const repoRoot = resolve(import.meta.dirname, '..', '..', '..');

export async function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const server = createServer();
    server.once('error', fail);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as { port: number };
      server.close(() => done(port));
    });
  });
}

export interface BuiltHub {
  url: string;
  output: () => string;
  /** kill -9: no shutdown hook runs, nothing is flushed. */
  kill: () => Promise<void>;
  /** Ctrl-C: the hub closes its database cleanly. */
  stop: () => Promise<void>;
}

/** Starts `hub/dist/main.js` as its own process on `dataDir` and waits until it is ready. */
export async function startBuiltHub(
  dataDir: string,
  env: Record<string, string>,
): Promise<BuiltHub> {
  const port = await freePort();
  const child: ChildProcess = spawn(process.execPath, [join(repoRoot, 'hub', 'dist', 'main.js')], {
    cwd: repoRoot,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      TARELINE_DATA_DIR: dataDir,
      LOG_LEVEL: 'warn',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout?.on('data', (chunk: Buffer) => (output += chunk.toString()));
  child.stderr?.on('data', (chunk: Buffer) => (output += chunk.toString()));
  const exited = new Promise<void>((done) => child.once('exit', () => done()));
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`hub exited with ${child.exitCode}:\n${output}`);
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`hub did not start within 60 s:\n${output}`);
    }
    const up = await fetch(`http://127.0.0.1:${port}/api/health`).then(
      (r) => r.ok,
      () => false,
    );
    if (up) break;
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    url: `http://127.0.0.1:${port}`,
    output: () => output,
    kill: async () => {
      child.kill('SIGKILL');
      await exited;
    },
    stop: async () => {
      child.kill('SIGINT');
      const timer = setTimeout(() => child.kill('SIGKILL'), 15_000);
      await exited;
      clearTimeout(timer);
    },
  };
}
