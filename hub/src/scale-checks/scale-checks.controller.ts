import { Body, Controller, Get, HttpCode, Inject, Param, Patch, Post } from '@nestjs/common';
import { benchIdSchema } from '@tareline/protocol';
import {
  benchPolicyPatchSchema,
  scaleCheckIdSchema,
  startScaleCheckSchema,
  type BenchCheckStatus,
  type BenchPolicyPatch,
  type ScaleCheck,
  type ScaleCheckStarted,
  type StartScaleCheck,
} from '@tareline/protocol/scale-checks';
import { Roles } from '../auth/access.decorator.js';
import type { AuthUser } from '../auth/auth-user.js';
import { CurrentUser } from '../auth/current-user.decorator.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { ScaleChecksService } from './scale-checks.service.js';

const benchId = new ZodValidationPipe(benchIdSchema, 'Not a bench id');
const checkId = new ZodValidationPipe(scaleCheckIdSchema, 'Not a check number');

/** Scale checks at a bench, and the bench's check policy. Thin: the rules are in the service. */
@Controller('benches')
export class ScaleChecksController {
  constructor(@Inject(ScaleChecksService) private readonly checks: ScaleChecksService) {}

  /** Starts a check; the hub then waits for the weight and takes the reading itself. */
  // Admins pass the guard only to be told by the service: a check is a lead's or the operator's.
  @Post(':id/checks')
  @Roles('operator', 'lead', 'admin')
  start(
    @Param('id', benchId) id: string,
    @Body(new ZodValidationPipe(startScaleCheckSchema, 'Not a scale check')) body: StartScaleCheck,
    @CurrentUser() user: AuthUser,
  ): Promise<ScaleCheckStarted> {
    return this.checks.start(id, body, user);
  }

  /** The bench's checks, newest first (the last hundred). */
  @Get(':id/checks')
  @Roles('operator', 'lead', 'admin')
  list(@Param('id', benchId) id: string, @CurrentUser() user: AuthUser): Promise<ScaleCheck[]> {
    return this.checks.list(id, user);
  }

  @Get(':id/checks/:checkId')
  @Roles('operator', 'lead', 'admin')
  get(
    @Param('id', benchId) id: string,
    @Param('checkId', checkId) check: number,
    @CurrentUser() user: AuthUser,
  ): Promise<ScaleCheck> {
    return this.checks.get(id, check, user);
  }

  @Post(':id/checks/:checkId/cancel')
  @HttpCode(200)
  @Roles('operator', 'lead', 'admin')
  cancel(
    @Param('id', benchId) id: string,
    @Param('checkId', checkId) check: number,
    @CurrentUser() user: AuthUser,
  ): Promise<ScaleCheck> {
    return this.checks.cancel(id, check, user);
  }

  /** Whether a check is due, what the bench says about it, and the calibration due date. */
  @Get(':id/check-status')
  @Roles('operator', 'lead', 'admin')
  status(
    @Param('id', benchId) id: string,
    @CurrentUser() user: AuthUser,
  ): Promise<BenchCheckStatus> {
    return this.checks.status(id, user);
  }

  /** The bench's check policy (admins). */
  @Patch(':id')
  @Roles('admin')
  update(
    @Param('id', benchId) id: string,
    @Body(new ZodValidationPipe(benchPolicyPatchSchema, 'Not a bench change'))
    body: BenchPolicyPatch,
    @CurrentUser() user: AuthUser,
  ): Promise<BenchCheckStatus> {
    return this.checks.updatePolicy(id, body, user);
  }
}
