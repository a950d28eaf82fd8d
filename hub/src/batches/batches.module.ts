import { Module, RequestMethod, type MiddlewareConsumer, type NestModule } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module.js';
import { HubsModule } from '../hubs/hubs.module.js';
import { MaterialsModule } from '../materials/materials.module.js';
import { PourPlansModule } from '../pour-plans/pour-plans.module.js';
import { ScalesModule } from '../scales/scales.module.js';
import { AccuracyController } from './accuracy.controller.js';
import { BatchDeskRepository } from './batch-desk.repository.js';
import { BATCH_INTENTS, BatchIntentRouting } from './batch-intent.middleware.js';
import { BatchDeskService } from './batch-desk.service.js';
import { BatchRunner } from './batch-runner.js';
import { BatchesController } from './batches.controller.js';
import { BatchesRepository } from './batches.repository.js';
import { BatchesService } from './batches.service.js';
import { BenchSessions } from './bench-sessions.js';

/**
 * Batches in four rooms: the repositories (a batch's life; the lead's desk and its roll-up), the bench sessions (each bench's open
 * batch, written before it is announced), the runner (readings in, verdicts and auto-save out)
 * and the service (what people ask). They publish `batch.changed` and `pour.judged`.
 */
@Module({
  imports: [ScalesModule, MaterialsModule, PourPlansModule, AuditModule, HubsModule],
  controllers: [BatchesController, AccuracyController],
  providers: [
    BatchesRepository,
    BatchDeskRepository,
    BenchSessions,
    BatchRunner,
    BatchesService,
    BatchDeskService,
  ],
  // The repository for features that store their own rows with a batch's (alerts).
  exports: [BatchesService, BatchesRepository],
})
export class BatchesModule implements NestModule {
  configure(consumer: MiddlewareConsumer): void {
    // Intents at a bench another hub reads are handed to that hub (several hubs, one server).
    // The intents' own paths only, exactly as the controller declares them.
    consumer.apply(BatchIntentRouting).forRoutes(
      { path: 'batches', method: RequestMethod.POST },
      { path: 'batches/current', method: RequestMethod.GET },
      ...BATCH_INTENTS.map((intent) => ({
        path: `batches/:id/${intent}`,
        method: RequestMethod.POST,
      })),
    );
  }
}
