import { Module } from '@nestjs/common';
import { APP_FILTER } from '@nestjs/core';
import { LiveModule } from '../live/live.module.js';
import { MaterialsModule } from '../materials/materials.module.js';
import { ScalesModule } from '../scales/scales.module.js';
import { BatchRefusalFilter } from './batch-refusal.filter.js';
import { BatchesController } from './batches.controller.js';
import { BatchesService } from './batches.service.js';

@Module({
  imports: [ScalesModule, LiveModule, MaterialsModule],
  controllers: [BatchesController],
  providers: [BatchesService, { provide: APP_FILTER, useClass: BatchRefusalFilter }],
  exports: [BatchesService],
})
export class BatchesModule {}
