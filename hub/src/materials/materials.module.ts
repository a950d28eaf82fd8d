import { AuditModule } from '../audit/audit.module.js';
import { Module } from '@nestjs/common';
import { MaterialsController } from './materials.controller.js';
import { MaterialsRepository } from './materials.repository.js';
import { MaterialsService } from './materials.service.js';

@Module({
  imports: [AuditModule],
  controllers: [MaterialsController],
  providers: [MaterialsRepository, MaterialsService],
  // The repository for the stock ledger, which writes in a batch's transaction.
  exports: [MaterialsService, MaterialsRepository],
})
export class MaterialsModule {}
