import { createHmac, randomBytes, scrypt, timingSafeEqual, type ScryptOptions } from 'node:crypto';
import { Inject, Injectable } from '@nestjs/common';
import { AUTH_KEYS, type AuthKeys } from './secrets.js';

// OWASP Password Storage Cheat Sheet's scrypt minimum: N=2^17, r=8, p=1 (memory). 2^15 keeps
// a bench sign-in under about 100 ms on a small shop PC; raise N here and old hashes still verify,
// because each hash records its own parameters.
const SCRYPT = { N: 2 ** 15, r: 8, p: 1, keyLen: 32, saltLen: 16 };

function scryptAsync(secret: string, salt: Buffer, keyLen: number, opts: ScryptOptions) {
  return new Promise<Buffer>((resolve, reject) =>
    scrypt(secret, salt, keyLen, { ...opts, maxmem: 256 * opts.N! * opts.r! }, (err, key) =>
      err ? reject(err) : resolve(key),
    ),
  );
}

/** Hashes and checks badge codes, PINs and passwords; never keeps or logs what it is given. */
@Injectable()
export class CredentialHasher {
  /** Checked when there is no real hash, so a miss costs the same time as a wrong secret. */
  private readonly dummyHash: Promise<string>;

  constructor(@Inject(AUTH_KEYS) private readonly keys: AuthKeys) {
    this.dummyHash = this.hashSecret(randomBytes(16).toString('hex'));
  }

  /** Keyed hash of a badge code, so the database can find a badge without holding the code. */
  badgeHash(badge: string): string {
    return createHmac('sha256', this.keys.badgeKey).update(badge.trim(), 'utf8').digest('hex');
  }

  /** scrypt hash of a PIN or password, as `scrypt$N$r$p$salt$key` (base64url). */
  async hashSecret(secret: string): Promise<string> {
    const salt = randomBytes(SCRYPT.saltLen);
    const key = await scryptAsync(secret, salt, SCRYPT.keyLen, {
      N: SCRYPT.N,
      r: SCRYPT.r,
      p: SCRYPT.p,
    });
    return [
      'scrypt',
      SCRYPT.N,
      SCRYPT.r,
      SCRYPT.p,
      salt.toString('base64url'),
      key.toString('base64url'),
    ].join('$');
  }

  /**
   * True when `secret` matches `hash`. With no hash (unknown person, no PIN set) it checks a dummy
   * hash and answers false, taking the same time as a real check.
   */
  async verifySecret(secret: string, hash: string | null | undefined): Promise<boolean> {
    const stored = hash ?? (await this.dummyHash);
    const parts = stored.split('$');
    if (parts.length !== 6 || parts[0] !== 'scrypt') return false;
    const [, n, r, p, saltText, keyText] = parts as [
      string,
      string,
      string,
      string,
      string,
      string,
    ];
    const expected = Buffer.from(keyText, 'base64url');
    const actual = await scryptAsync(secret, Buffer.from(saltText, 'base64url'), expected.length, {
      N: Number(n),
      r: Number(r),
      p: Number(p),
    });
    return timingSafeEqual(actual, expected) && hash != null;
  }
}
