import { Controller, Get, Inject } from '@nestjs/common';
import type { HealthResponse } from '@tareline/protocol';
import { Public } from '../auth/access.decorator.js';
import { HealthService } from './health.service.js';

@Controller('health')
export class HealthController {
  constructor(@Inject(HealthService) private readonly health: HealthService) {}

  @Get()
  @Public()
  check(): Promise<HealthResponse> {
    return this.health.check();
  }
}
