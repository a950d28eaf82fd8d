import { Module, RequestMethod, type MiddlewareConsumer, type NestModule } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module.js';
import { HubsModule } from '../hubs/hubs.module.js';
import { ScalesModule } from '../scales/scales.module.js';
import { BenchIntentRouting } from './bench-intent.middleware.js';
import { BenchesController } from './benches.controller.js';
import { BenchesRepository } from './benches.repository.js';
import { BenchesService } from './benches.service.js';

@Module({
  imports: [ScalesModule, AuditModule, HubsModule],
  controllers: [BenchesController],
  providers: [BenchesRepository, BenchesService],
  exports: [BenchesService],
})
export class BenchesModule implements NestModule {
  configure(consumer: MiddlewareConsumer): void {
    consumer
      .apply(BenchIntentRouting)
      .forRoutes({ path: 'benches/:id/simulator', method: RequestMethod.POST });
  }
}
