import { Module } from '@nestjs/common';
import { AuditController } from './audit.controller.js';
import { AuditRepository } from './audit.repository.js';
import { AuditService } from './audit.service.js';

/** The hash-chained audit trail; other modules append through the repository's transaction. */
@Module({
  controllers: [AuditController],
  providers: [AuditRepository, AuditService],
  exports: [AuditRepository],
})
export class AuditModule {}
