import type { INestApplicationContext } from '@nestjs/common';
import { IoAdapter } from '@nestjs/platform-socket.io';
import { createAdapter } from '@socket.io/postgres-adapter';
import pg from 'pg';
import type { Server, ServerOptions } from 'socket.io';

/**
 * The live socket across hubs: what one hub emits to a bench's room reaches the screens on every
 * hub sharing the server PostgreSQL, as NOTIFY messages (large ones through the
 * `socket_io_attachments` table of the hub's migrations). Its own small pool: one connection
 * listens, and one sends, in order, so a bench's readings arrive in the order they were read.
 */
export class PostgresIoAdapter extends IoAdapter {
  private readonly pool: pg.Pool;

  constructor(app: INestApplicationContext, url: string) {
    super(app);
    this.pool = new pg.Pool({ connectionString: url, max: 2 });
    this.pool.on('error', () => undefined);
  }

  override createIOServer(port: number, options?: ServerOptions): Server {
    const server = super.createIOServer(port, options) as Server;
    server.adapter(createAdapter(this.pool, { errorHandler: () => undefined }));
    return server;
  }

  override async dispose(): Promise<void> {
    await super.dispose();
    await this.pool.end().catch(() => undefined);
  }
}
