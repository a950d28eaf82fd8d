import { Global, Module } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module.js';
import { BatchesModule } from '../batches/batches.module.js';
import { ScalesModule } from '../scales/scales.module.js';
import { ScaleCheckGate } from './scale-check-gate.js';
import { ScaleChecksController } from './scale-checks.controller.js';
import { ScaleChecksRepository } from './scale-checks.repository.js';
import { ScaleChecksService } from './scale-checks.service.js';

/**
 * Scale checks with a reference weight. Global for its gate only: the batches feature asks it
 * before a batch starts, without the two modules importing each other.
 */
@Global()
@Module({
  imports: [ScalesModule, BatchesModule, AuditModule],
  controllers: [ScaleChecksController],
  providers: [ScaleChecksRepository, ScaleCheckGate, ScaleChecksService],
  exports: [ScaleCheckGate],
})
export class ScaleChecksModule {}
