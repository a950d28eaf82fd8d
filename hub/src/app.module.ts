import { DynamicModule, Module } from '@nestjs/common';
import { ServeStaticModule } from '@nestjs/serve-static';
import type { AppConfig } from './config/app-config.js';
import { AlertsModule } from './alerts/alerts.module.js';
import { AuthModule } from './auth/auth.module.js';
import { BackupModule } from './backup/backup.module.js';
import { ConfigModule } from './config/config.module.js';
import { DatabaseModule } from './database/database.module.js';
import { DemoModule } from './demo/demo.module.js';
import { EventsModule } from './events/events.module.js';
import { HealthModule } from './health/health.module.js';
import { MaterialsModule } from './materials/materials.module.js';
import { PlanModule } from './plan/plan.module.js';
import { PourPlansModule } from './pour-plans/pour-plans.module.js';
import { DocumentsModule } from './documents/documents.module.js';
import { PeopleModule } from './people/people.module.js';
import { BenchesModule } from './benches/benches.module.js';
import { BatchesModule } from './batches/batches.module.js';
import { LiveModule } from './live/live.module.js';
import { ScalesModule } from './scales/scales.module.js';
import { StockModule } from './stock/stock.module.js';
import { ScaleChecksModule } from './scale-checks/scale-checks.module.js';

@Module({})
export class AppModule {
  static forRoot(config: AppConfig): DynamicModule {
    return {
      module: AppModule,
      imports: [
        ConfigModule.forRoot(config),
        DatabaseModule,
        EventsModule,
        AuthModule,
        HealthModule,
        ScalesModule,
        BenchesModule,
        LiveModule,
        MaterialsModule,
        PlanModule,
        PourPlansModule,
        DocumentsModule,
        PeopleModule,
        DemoModule,
        BatchesModule,
        ScaleChecksModule,
        BackupModule,
        AlertsModule,
        StockModule,
        // The built station, with client routes falling back to index.html.
        ServeStaticModule.forRoot({
          rootPath: config.paths.station,
          exclude: ['/api{/*path}', '/socket.io{/*path}'],
        }),
      ],
    };
  }
}
