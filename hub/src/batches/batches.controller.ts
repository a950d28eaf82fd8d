import {
  Body,
  Controller,
  Get,
  Inject,
  Param,
  type PipeTransform,
  Post,
  Query,
  StreamableFile,
  UseGuards,
} from '@nestjs/common';
import { ThrottlerGuard } from '@nestjs/throttler';
import {
  abandonBatchSchema,
  batchFilterSchema,
  batchListQuerySchema,
  batchNumberSchema,
  createBatchSchema,
  createDispositionSchema,
  currentBatchQuerySchema,
  type Batch,
  type BatchPage,
} from '@tareline/protocol';
import { z } from 'zod';
import { Roles } from '../auth/access.decorator.js';
import type { AuthUser } from '../auth/auth-user.js';
import { CurrentUser } from '../auth/current-user.decorator.js';
import { InvalidInput } from '../common/domain-errors.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { BatchDeskService } from './batch-desk.service.js';
import { BatchesService } from './batches.service.js';
import { OverrideThrottlerGuard } from './override-throttler.guard.js';

const listQuerySchema = batchListQuerySchema;
const currentQuerySchema = currentBatchQuerySchema;
/** The `:id` of a batch route; a bad one is a 400 naming `id`, never a database error. */
class BatchNumberPipe implements PipeTransform<unknown, number> {
  transform(value: unknown): number {
    const parsed = batchNumberSchema.safeParse(value);
    if (parsed.success) return parsed.data;
    const message = parsed.error.issues[0]?.message ?? 'A batch number is a whole number';
    throw new InvalidInput(message, [{ path: 'id', message }]);
  }
}
const batchId = new BatchNumberPipe();

/** Thin: every rule lives in BatchesService and the batch state machine. */
@Controller('batches')
@Roles('operator', 'lead', 'admin')
export class BatchesController {
  constructor(
    @Inject(BatchesService) private readonly batches: BatchesService,
    @Inject(BatchDeskService) private readonly desk: BatchDeskService,
  ) {}

  /** A page of batches by filter and sort; an operator's are their own bench's. */
  @Get()
  list(
    @Query(new ZodValidationPipe(listQuerySchema)) q: z.output<typeof listQuerySchema>,
    @CurrentUser() user: AuthUser,
  ): Promise<BatchPage> {
    return this.desk.search(q, user);
  }

  /** Every batch the filters match, as CSV, streamed. Declared before `:id`, which it is not. */
  @Get('export.csv')
  @Roles('lead', 'admin')
  exportCsv(
    @Query(new ZodValidationPipe(batchFilterSchema)) q: z.output<typeof batchFilterSchema>,
  ): StreamableFile {
    return new StreamableFile(this.desk.exportCsv(q), {
      type: 'text/csv; charset=utf-8',
      disposition: 'attachment; filename="batches.csv"',
    });
  }

  /** The bench's batch in progress, so a reloaded bench screen picks it up again. */
  @Get('current')
  current(
    @Query(new ZodValidationPipe(currentQuerySchema)) q: z.output<typeof currentQuerySchema>,
    @CurrentUser() user: AuthUser,
  ): { batch: Batch | null } {
    return { batch: this.batches.current(q.benchId, user) };
  }

  @Get(':id')
  get(@Param('id', batchId) id: number, @CurrentUser() user: AuthUser): Promise<Batch> {
    return this.desk.detail(id, user);
  }

  /** A lead's decision on a saved batch, signed with their password; never edited afterwards. */
  @Post(':id/dispositions')
  @Roles('lead', 'admin')
  // A password is checked here: guesses count against the address's sign-in budget.
  @UseGuards(ThrottlerGuard)
  decide(
    @Param('id', batchId) id: number,
    @Body(new ZodValidationPipe(createDispositionSchema, 'The decision is not recorded'))
    body: z.output<typeof createDispositionSchema>,
    @CurrentUser() user: AuthUser,
  ): Promise<Batch> {
    return this.desk.decide(id, body, user);
  }

  @Post()
  // A lead's password may come with it (an override): those count against the sign-in budget.
  @UseGuards(OverrideThrottlerGuard)
  create(
    @Body(new ZodValidationPipe(createBatchSchema, 'The batch cannot start'))
    body: z.output<typeof createBatchSchema>,
    @CurrentUser() user: AuthUser,
  ): Promise<Batch> {
    return this.batches.create(body, user);
  }

  @Post(':id/tare')
  tare(@Param('id', batchId) id: number, @CurrentUser() user: AuthUser): Promise<Batch> {
    return this.batches.tare(id, user);
  }

  @Post(':id/next')
  next(@Param('id', batchId) id: number, @CurrentUser() user: AuthUser): Promise<Batch> {
    return this.batches.next(id, user);
  }

  @Post(':id/rescue')
  rescue(@Param('id', batchId) id: number, @CurrentUser() user: AuthUser): Promise<Batch> {
    return this.batches.rescue(id, user);
  }

  @Post(':id/save-no-go')
  saveNoGo(@Param('id', batchId) id: number, @CurrentUser() user: AuthUser): Promise<Batch> {
    return this.batches.saveNoGo(id, user);
  }

  @Post(':id/abandon')
  abandon(
    @Param('id', batchId) id: number,
    @Body(new ZodValidationPipe(abandonBatchSchema)) body: z.output<typeof abandonBatchSchema>,
    @CurrentUser() user: AuthUser,
  ): Promise<Batch> {
    return this.batches.abandon(id, body.reason, user);
  }

  @Post(':id/resume')
  resume(@Param('id', batchId) id: number, @CurrentUser() user: AuthUser): Promise<Batch> {
    return this.batches.resume(id, user);
  }
}
