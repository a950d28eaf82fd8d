import { Inject, Injectable } from '@nestjs/common';
import type { HealthResponse } from '@tareline/protocol';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { Database } from '../database/database.js';

@Injectable()
export class HealthService {
  private readonly startedAt = performance.now();

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(Database) private readonly database: Database,
  ) {}

  async check(): Promise<HealthResponse> {
    const uptimeS = (performance.now() - this.startedAt) / 1000;
    try {
      await this.database.ping();
      return {
        status: 'ok',
        version: this.config.version,
        uptimeS,
        db: { ok: true, driver: this.database.driver },
      };
    } catch (err) {
      return {
        status: 'degraded',
        version: this.config.version,
        uptimeS,
        db: { ok: false, driver: this.database.driver, detail: (err as Error).message },
      };
    }
  }
}
