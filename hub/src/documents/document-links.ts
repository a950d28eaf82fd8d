import { createHmac, timingSafeEqual } from 'node:crypto';
import { Inject, Injectable } from '@nestjs/common';
import { DOCUMENT_LINK_TTL_MS } from '@tareline/protocol';
import { CLOCK, type Clock } from '../common/clock.js';

export const DOCUMENT_LINK_KEY = Symbol('DOCUMENT_LINK_KEY');

/**
 * Signed links to one document for a few minutes. A browser tab opened from a link cannot send
 * the session's bearer token, so the signed-in station asks for the list of sheets and gets, per
 * sheet, `?link=<expiry>.<HMAC-SHA-256(id.expiry)>` under a key of the data folder's own.
 */
@Injectable()
export class DocumentLinks {
  constructor(
    @Inject(DOCUMENT_LINK_KEY) private readonly key: string,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  private sign(id: string, expiresAt: number): string {
    return createHmac('sha256', this.key).update(`${id}.${expiresAt}`).digest('base64url');
  }

  /** The address that opens document `id` without a token until the link runs out. */
  urlFor(id: string): string {
    const expiresAt = this.clock.now() + DOCUMENT_LINK_TTL_MS;
    return `/api/documents/${encodeURIComponent(id)}/open?link=${expiresAt}.${this.sign(id, expiresAt)}`;
  }

  /** Whether `link` was made for document `id` and has not run out. */
  verify(id: string, link: string): boolean {
    const [expiry, signature] = link.split('.');
    const expiresAt = Number(expiry);
    if (!signature || !Number.isSafeInteger(expiresAt) || expiresAt < this.clock.now()) {
      return false;
    }
    const expected = Buffer.from(this.sign(id, expiresAt));
    const given = Buffer.from(signature);
    return expected.length === given.length && timingSafeEqual(expected, given);
  }
}
