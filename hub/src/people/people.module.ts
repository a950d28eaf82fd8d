import { AuditModule } from '../audit/audit.module.js';
import { Module } from '@nestjs/common';
import { PeopleController } from './people.controller.js';
import { PeopleRepository } from './people.repository.js';
import { PeopleService } from './people.service.js';

@Module({
  imports: [AuditModule],
  controllers: [PeopleController],
  providers: [PeopleRepository, PeopleService],
  exports: [PeopleRepository, PeopleService],
})
export class PeopleModule {}
