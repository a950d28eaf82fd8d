import { Module } from '@nestjs/common';
import { MaterialsModule } from '../materials/materials.module.js';
import { PourPlansController } from './pour-plans.controller.js';
import { PourPlansRepository } from './pour-plans.repository.js';
import { PourPlansService } from './pour-plans.service.js';

/** Saved pour plans per mold or part; batches start from them (see BatchesService). */
@Module({
  imports: [MaterialsModule],
  controllers: [PourPlansController],
  providers: [PourPlansRepository, PourPlansService],
  exports: [PourPlansService],
})
export class PourPlansModule {}
