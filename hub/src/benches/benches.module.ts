import { AuditModule } from '../audit/audit.module.js';
import { Module } from '@nestjs/common';
import { ScalesModule } from '../scales/scales.module.js';
import { BenchesController } from './benches.controller.js';
import { BenchesRepository } from './benches.repository.js';
import { BenchesService } from './benches.service.js';

@Module({
  imports: [ScalesModule, AuditModule],
  controllers: [BenchesController],
  providers: [BenchesRepository, BenchesService],
  exports: [BenchesService],
})
export class BenchesModule {}
