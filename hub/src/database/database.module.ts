import { Global, Inject, Logger, Module, OnApplicationShutdown } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { Database } from './database.js';

@Global()
@Module({
  providers: [
    {
      provide: Database,
      inject: [APP_CONFIG],
      useFactory: async (config: AppConfig): Promise<Database> => {
        const database = await Database.open(
          config.data.dir,
          config.paths.migrations,
          config.database.url,
        );
        new Logger('Database').log(
          database.driver === 'pglite'
            ? `Embedded PostgreSQL open in ${config.data.dir}`
            : `PostgreSQL server open (hub ${config.hub.id})`,
        );
        return database;
      },
    },
  ],
  exports: [Database],
})
export class DatabaseModule implements OnApplicationShutdown {
  constructor(@Inject(Database) private readonly database: Database) {}

  async onApplicationShutdown(): Promise<void> {
    const what =
      this.database.driver === 'pglite' ? 'Embedded PostgreSQL' : 'PostgreSQL connections';
    await this.database.close();
    new Logger('Database').log(`${what} closed`);
  }
}
