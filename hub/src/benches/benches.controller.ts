import { Body, Controller, Get, HttpCode, Inject, Param, Post } from '@nestjs/common';
import {
  benchIdSchema,
  simulatorScriptSchema,
  type BenchSummary,
  type SimulatorStep,
} from '@tareline/protocol';
import { Roles } from '../auth/access.decorator.js';
import type { AuthUser } from '../auth/auth-user.js';
import { CurrentUser } from '../auth/current-user.decorator.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { BenchesService } from './benches.service.js';

@Controller('benches')
export class BenchesController {
  constructor(@Inject(BenchesService) private readonly benches: BenchesService) {}

  /** Needed right after sign-in (which bench am I at, is its scale up). */
  @Get()
  @Roles('operator', 'lead', 'admin')
  list(): Promise<BenchSummary[]> {
    return this.benches.list();
  }

  /**
   * Drives a simulated bench's scale through scripted steps (demos and browser tests): only for
   * someone who may work at that bench (409 for a real scale), and recorded with who did it.
   */
  @Post(':id/simulator')
  @HttpCode(200)
  @Roles('operator', 'lead', 'admin')
  async runSimulator(
    @Param('id', new ZodValidationPipe(benchIdSchema, 'Not a bench id')) id: string,
    @Body(new ZodValidationPipe(simulatorScriptSchema, 'Not a simulator script'))
    steps: SimulatorStep[],
    @CurrentUser() user: AuthUser,
  ): Promise<{ benchId: string; steps: number }> {
    await this.benches.runSimulator(id, steps, user);
    return { benchId: id, steps: steps.length };
  }
}
