import { Inject, Injectable, type NestMiddleware } from '@nestjs/common';
import type { NextFunction, Request, Response } from 'express';
import { IntentForwarder } from '../hubs/intent-forwarder.js';

const SIMULATOR_ROUTE = /^\/api\/benches\/([^/?]+)\/simulator$/;

/** Driving a simulated scale read by another hub: that hub runs the simulator. */
@Injectable()
export class BenchIntentRouting implements NestMiddleware {
  constructor(@Inject(IntentForwarder) private readonly forwarder: IntentForwarder) {}

  async use(req: Request, res: Response, next: NextFunction): Promise<void> {
    const match =
      req.method === 'POST' ? SIMULATOR_ROUTE.exec(req.originalUrl.split('?')[0]!) : null;
    try {
      const benchId = match ? decodeURIComponent(match[1]!) : undefined;
      if (!(await this.forwarder.forward(req, res, benchId))) next();
    } catch (err) {
      next(err);
    }
  }
}
