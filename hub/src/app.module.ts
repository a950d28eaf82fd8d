import { DynamicModule, Module } from '@nestjs/common';
import { ServeStaticModule } from '@nestjs/serve-static';
import type { AppConfig } from './config/app-config.js';
import { ConfigModule } from './config/config.module.js';
import { DatabaseModule } from './database/database.module.js';
import { HealthModule } from './health/health.module.js';
import { MaterialsModule } from './materials/materials.module.js';
import { PlanModule } from './plan/plan.module.js';

@Module({})
export class AppModule {
  static forRoot(config: AppConfig): DynamicModule {
    return {
      module: AppModule,
      imports: [
        ConfigModule.forRoot(config),
        DatabaseModule,
        HealthModule,
        MaterialsModule,
        PlanModule,
        // The built station, with client routes falling back to index.html.
        ServeStaticModule.forRoot({
          rootPath: config.paths.station,
          exclude: ['/api{/*path}', '/socket.io{/*path}'],
        }),
      ],
    };
  }
}
