import { Controller, Get, Inject, Query } from '@nestjs/common';
import { auditQuerySchema, type AuditPage, type AuditVerify } from '@tareline/protocol';
import type { z } from 'zod';
import { Roles } from '../auth/access.decorator.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { AuditService } from './audit.service.js';

@Controller('audit')
@Roles('lead', 'admin')
export class AuditController {
  constructor(@Inject(AuditService) private readonly audit: AuditService) {}

  @Get()
  list(
    @Query(new ZodValidationPipe(auditQuerySchema)) q: z.output<typeof auditQuerySchema>,
  ): Promise<AuditPage> {
    return this.audit.list(q);
  }

  @Get('verify')
  verify(): Promise<AuditVerify> {
    return this.audit.verify();
  }
}
