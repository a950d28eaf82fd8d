import { randomBytes } from 'node:crypto';
import { chmod, mkdir, readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';

/**
 * A secret from the environment, or else from a file in the data folder, created on first start
 * with 32 random bytes and readable only by the hub's user (mode 0600).
 */
export async function loadOrCreateSecret(
  dataDir: string,
  fileName: string,
  fromEnv: string | undefined,
): Promise<string> {
  if (fromEnv) return fromEnv;
  await mkdir(dataDir, { recursive: true });
  const path = join(dataDir, fileName);
  try {
    // 'wx' fails when the file exists, so two starts never overwrite each other's secret.
    await writeFile(path, `${randomBytes(32).toString('base64url')}\n`, {
      mode: 0o600,
      flag: 'wx',
    });
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
    // Someone may have copied the folder with looser permissions.
    await chmod(path, 0o600);
  }
  const secret = (await readFile(path, 'utf8')).trim();
  if (secret.length < 32) throw new Error(`${path} holds a secret shorter than 32 characters`);
  return secret;
}

/** Secrets of one hub, loaded once at start-up. */
export interface AuthKeys {
  jwtSecret: string;
  badgeKey: string;
}

export const AUTH_KEYS = Symbol('AUTH_KEYS');
