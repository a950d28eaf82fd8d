import { createHmac, timingSafeEqual } from 'node:crypto';
import { Inject, Injectable, Logger } from '@nestjs/common';
import type { Request, Response } from 'express';
import { CLOCK, type Clock } from '../common/clock.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { HubDirectory } from './hub-directory.js';

/** The header a hub signs a handed-on request with (HMAC-SHA-256 under the shared JWT secret). */
export const FORWARDED_HEADER = 'x-tareline-forwarded';
/** A signature older than this is refused: a copied request cannot be replayed later. */
const SIGNATURE_TTL_MS = 30_000;
/** How long the owning hub may take to answer before the operator is told it did not. */
const FORWARD_TIMEOUT_MS = 20_000;

/**
 * Hands an operator's intent at a bench whose scale another hub reads to that hub, over HTTP,
 * and passes its answer back unchanged: the batch lives in the owning hub's memory beside the
 * scale, so the answer is the one the owning hub gives. The request keeps the person's own
 * token (the owning hub checks it as usual: every hub has the same JWT secret) and carries a
 * signature of this hub, so the owning hub handles it itself instead of handing it on again.
 */
@Injectable()
export class IntentForwarder {
  private readonly logger = new Logger('Hubs');

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(HubDirectory) private readonly directory: HubDirectory,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  /**
   * Answers the request through the hub that reads `benchId`'s scale; false when this hub is to
   * handle it (its own bench, an unknown bench, a request already handed on).
   */
  async forward(req: Request, res: Response, benchId: string | undefined): Promise<boolean> {
    if (!this.directory.shared) return false;
    const signature = req.header(FORWARDED_HEADER);
    if (signature !== undefined) {
      if (this.verify(signature, req)) return false;
      res.status(401).json({
        message:
          'A request handed on by another hub carried a wrong signature: the hubs must share one TARELINE_JWT_SECRET',
        errors: [],
      });
      return true;
    }
    if (!benchId) return false;
    const remote = this.directory.remote(benchId);
    if (!remote) return false;
    if (!remote.alive || !remote.internalUrl) {
      res.status(503).json(notAnswering(benchId, remote.hubId));
      return true;
    }
    const headers: Record<string, string> = {
      [FORWARDED_HEADER]: this.sign(req.method, req.originalUrl),
      accept: 'application/json',
    };
    const authorization = req.header('authorization');
    if (authorization) headers.authorization = authorization;
    const hasBody = req.method !== 'GET' && req.method !== 'HEAD';
    if (hasBody) headers['content-type'] = 'application/json';
    try {
      const answer = await fetch(`${remote.internalUrl}${req.originalUrl}`, {
        method: req.method,
        headers,
        body: hasBody ? JSON.stringify(req.body ?? {}) : undefined,
        signal: AbortSignal.timeout(FORWARD_TIMEOUT_MS),
      });
      res.status(answer.status);
      const type = answer.headers.get('content-type');
      if (type) res.setHeader('content-type', type);
      res.send(Buffer.from(await answer.arrayBuffer()));
    } catch (err) {
      this.logger.warn(
        `${req.method} ${req.originalUrl} not handed to ${remote.hubId}: ${(err as Error).message}`,
      );
      if (!res.headersSent) res.status(503).json(notAnswering(benchId, remote.hubId));
    }
    return true;
  }

  private sign(
    method: string,
    url: string,
    at = this.clock.now(),
    hubId = this.config.hub.id,
  ): string {
    return `${hubId}.${at}.${this.mac(hubId, at, method, url)}`;
  }

  private verify(signature: string, req: Request): boolean {
    const [hubId, atText, mac] = signature.split('.');
    const at = Number(atText);
    if (!hubId || !mac || !Number.isFinite(at)) return false;
    if (Math.abs(this.clock.now() - at) > SIGNATURE_TTL_MS) return false;
    const expected = Buffer.from(this.mac(hubId, at, req.method, req.originalUrl));
    const given = Buffer.from(mac);
    return expected.length === given.length && timingSafeEqual(expected, given);
  }

  private mac(hubId: string, at: number, method: string, url: string): string {
    // A hub on a server database always has the secret from the environment (config checks).
    return createHmac('sha256', this.config.auth.jwtSecret ?? '')
      .update(`${hubId}\n${at}\n${method}\n${url}`)
      .digest('hex');
  }
}

function notAnswering(benchId: string, hubId: string) {
  return {
    message:
      `The scale of ${benchId} is read by the hub "${hubId}", which is not answering: ` +
      'nothing was changed. Try again once that hub is back',
    errors: [{ path: 'benchId', message: `Hub ${hubId} is not answering` }],
  };
}
