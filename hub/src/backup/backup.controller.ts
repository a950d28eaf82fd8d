import { Controller, Get, Header, Inject, StreamableFile } from '@nestjs/common';
import { Roles } from '../auth/access.decorator.js';
import { Database } from '../database/database.js';
import { backupOf } from './backup.js';

/** A consistent copy of the running hub's database, for `npm run backup` (admins only). */
@Controller('backup')
export class BackupController {
  constructor(@Inject(Database) private readonly database: Database) {}

  @Get()
  @Roles('admin')
  @Header('Cache-Control', 'no-store')
  async download(): Promise<StreamableFile> {
    const backup = await backupOf(this.database);
    const stamp = new Date().toISOString().replace(/[:.]/g, '-');
    // The type on the file itself, not the route: a refusal is answered in JSON.
    return new StreamableFile(backup, {
      type: 'application/gzip',
      disposition: `attachment; filename="tareline-backup-${stamp}.tar.gz"`,
    });
  }
}
