/**
 * How long the hub takes to refuse an unknown badge and a known badge with a wrong PIN; the two
 * should be indistinguishable. Starts the built hub (`npm run build` first) on a fresh
 * data folder with the demo shop, then times both refusals, interleaved.
 *
 *   npx tsx hub/scripts/sign-in-timing.ts [rounds]
 *
 * Results go in docs/benchmarks/sign-in-timing.md by hand, with the machine they ran on.
 */
import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

const repoRoot = resolve(import.meta.dirname, '..', '..');
const rounds = Number(process.argv[2] ?? 60);
const port = 30_000 + Math.floor(Math.random() * 20_000);
const url = `http://127.0.0.1:${port}`;

async function main(): Promise<void> {
  const dataDir = await mkdtemp(join(tmpdir(), 'tareline-timing-'));
  const hub = spawn(process.execPath, [join(repoRoot, 'hub', 'dist', 'main.js')], {
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      TARELINE_DATA_DIR: dataDir,
      TARELINE_SIGN_IN_LIMIT: '100000',
      LOG_LEVEL: 'warn',
    },
    stdio: 'ignore',
  });
  try {
    await waitForHub();
    const post = async (badge: string, pin: string) => {
      const started = performance.now();
      const res = await fetch(`${url}/api/auth/badge`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json' },
        body: JSON.stringify({ benchId: 'bench-1', badge, pin }),
      });
      await res.text();
      return { ms: performance.now() - started, status: res.status };
    };
    const unknown: number[] = [];
    const wrongPin: number[] = [];
    for (let i = 0; i < rounds; i += 1) {
      // A fresh unknown badge each time, and the right PIN every fourth try, so nothing locks.
      const a = await post(`ZZ-${randomBytes(4).toString('hex')}`, '9999');
      const b = await post('HR-1001', '9999');
      if (a.status !== 401 || b.status !== 401)
        throw new Error(`unexpected ${a.status}/${b.status}`);
      unknown.push(a.ms);
      wrongPin.push(b.ms);
      if (i % 4 === 3) await post('HR-1001', '1357');
    }
    const line = (name: string, xs: number[]) => {
      const s = [...xs].sort((x, y) => x - y);
      const q = (p: number) => s[Math.min(s.length - 1, Math.floor(p * s.length))]!.toFixed(1);
      return `| ${name} | ${s.length} | ${q(0.5)} | ${q(0.1)} | ${q(0.9)} |`;
    };
    console.log('| refusal | n | median ms | p10 ms | p90 ms |');
    console.log('| --- | --- | --- | --- | --- |');
    console.log(line('unknown badge', unknown));
    console.log(line('known badge, wrong PIN', wrongPin));
  } finally {
    hub.kill('SIGINT');
    await new Promise((r) => hub.once('exit', r));
    await rm(dataDir, { recursive: true, force: true });
  }
}

async function waitForHub(): Promise<void> {
  const deadline = Date.now() + 120_000;
  while (Date.now() < deadline) {
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) {
        // The demo shop is seeded right after start-up: wait for its badges.
        const probe = await fetch(`${url}/api/auth/badge`, {
          method: 'POST',
          headers: { 'Content-Type': 'application/json' },
          body: JSON.stringify({ benchId: 'bench-1', badge: 'HR-1003' }),
        });
        if (probe.status === 200) return;
      }
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error('hub did not start within 120 s');
}

main().catch((err: unknown) => {
  console.error(err);
  process.exitCode = 1;
});
