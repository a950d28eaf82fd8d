import { Inject, Injectable, type NestMiddleware } from '@nestjs/common';
import type { NextFunction, Request, Response } from 'express';
import { IntentForwarder } from '../hubs/intent-forwarder.js';
import { BatchesRepository } from './batches.repository.js';

/** `POST /api/batches/:id/<intent>`: an operator's acts on an open batch. */
export const BATCH_INTENTS = ['tare', 'next', 'rescue', 'save-no-go', 'abandon', 'resume'] as const;
const BATCH_INTENT = new RegExp(`^/api/batches/(\\d{1,9})/(${BATCH_INTENTS.join('|')})$`);

/**
 * A batch intent at a bench whose scale another hub reads goes to that hub (the open batch is in
 * its memory); anything this hub cannot place (bad input) is left to the usual validation here.
 */
@Injectable()
export class BatchIntentRouting implements NestMiddleware {
  constructor(
    @Inject(IntentForwarder) private readonly forwarder: IntentForwarder,
    @Inject(BatchesRepository) private readonly batches: BatchesRepository,
  ) {}

  async use(req: Request, res: Response, next: NextFunction): Promise<void> {
    try {
      if (!(await this.forwarder.forward(req, res, await this.benchOf(req)))) next();
    } catch (err) {
      next(err);
    }
  }

  private async benchOf(req: Request): Promise<string | undefined> {
    const path = req.originalUrl.split('?')[0]!.replace(/\/+$/, '');
    if (req.method === 'POST' && path === '/api/batches') {
      const benchId = (req.body as { benchId?: unknown } | undefined)?.benchId;
      return typeof benchId === 'string' ? benchId : undefined;
    }
    if (req.method === 'GET' && path === '/api/batches/current') {
      return typeof req.query.benchId === 'string' ? req.query.benchId : undefined;
    }
    const intent = req.method === 'POST' ? BATCH_INTENT.exec(path) : null;
    if (!intent) return undefined;
    return (await this.batches.findById(Number(intent[1])).catch(() => undefined))?.benchId;
  }
}
