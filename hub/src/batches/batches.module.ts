import { Module } from '@nestjs/common';
import { LiveModule } from '../live/live.module.js';
import { MaterialsModule } from '../materials/materials.module.js';
import { ScalesModule } from '../scales/scales.module.js';
import { BatchesController } from './batches.controller.js';
import { BatchesService } from './batches.service.js';

@Module({
  imports: [ScalesModule, LiveModule, MaterialsModule],
  controllers: [BatchesController],
  providers: [BatchesService],
  exports: [BatchesService],
})
export class BatchesModule {}
