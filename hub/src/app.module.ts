import { DynamicModule, Module } from '@nestjs/common';
import { ServeStaticModule } from '@nestjs/serve-static';
import type { AppConfig } from './config/app-config.js';
import { ConfigModule } from './config/config.module.js';
import { DatabaseModule } from './database/database.module.js';
import { BenchesModule } from './benches/benches.module.js';
import { HealthModule } from './health/health.module.js';
import { DevSocketAuthModule } from './live/dev-socket-authenticator.js';
import { LiveModule } from './live/live.module.js';
import { ScalesModule } from './scales/scales.module.js';

@Module({})
export class AppModule {
  static forRoot(config: AppConfig): DynamicModule {
    return {
      module: AppModule,
      imports: [
        ConfigModule.forRoot(config),
        DatabaseModule,
        HealthModule,
        ScalesModule,
        BenchesModule,
        LiveModule,
        // Until sign-in lands: any handshake for an existing bench. Remove when AuthModule
        // provides the real SOCKET_AUTHENTICATOR.
        DevSocketAuthModule,
        // The built station, with client routes falling back to index.html.
        ServeStaticModule.forRoot({
          rootPath: config.paths.station,
          exclude: ['/api{/*path}', '/socket.io{/*path}'],
        }),
      ],
    };
  }
}
