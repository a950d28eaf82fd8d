import { Inject, Injectable } from '@nestjs/common';
import { sql } from 'drizzle-orm';
import { Database } from '../database/database.js';
import type { ScaleSnapshot } from './hub-directory.js';

/** One hub as the others see it; `alive` is judged by the database's clock. */
export interface HubRow {
  id: string;
  internalUrl: string | null;
  alive: boolean;
  scales: Record<string, ScaleSnapshot>;
}

/** The only place that talks SQL about the hubs sharing a database. */
@Injectable()
export class HubsRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  /**
   * This hub is alive: its heartbeat, address and scales. Answers whether another hub had
   * found it gone since its last heartbeat (and so interrupted its open batches).
   */
  async beat(
    id: string,
    internalUrl: string,
    scales: Record<string, ScaleSnapshot>,
  ): Promise<{ wasNotedDown: boolean }> {
    const rows = await this.database.rows<{ was_noted_down: boolean }>(sql`
      with prev as (select down_noted_at from hubs where id = ${id})
      insert into hubs (id, internal_url, scales)
      values (${id}, ${internalUrl}, ${JSON.stringify(scales)}::jsonb)
      on conflict (id) do update set
        internal_url = excluded.internal_url,
        scales = excluded.scales,
        heartbeat_at = now(),
        down_noted_at = null
      returning coalesce((select down_noted_at is not null from prev), false) as was_noted_down`);
    return { wasNotedDown: rows[0]?.was_noted_down === true };
  }

  /** A hub stopping cleanly: the others see it gone at once. */
  async signOff(id: string): Promise<void> {
    await this.database.db.execute(
      sql`update hubs set heartbeat_at = now() - interval '1 hour' where id = ${id}`,
    );
  }

  /** Every hub, judged alive when its heartbeat is younger than `staleMs`. */
  async list(staleMs: number): Promise<HubRow[]> {
    const rows = await this.database.rows<{
      id: string;
      internal_url: string | null;
      alive: boolean;
      scales: Record<string, ScaleSnapshot>;
    }>(sql`
      select id, internal_url, scales,
        heartbeat_at > now() - make_interval(secs => ${staleMs / 1000}) as alive
      from hubs order by id`);
    return rows.map((r) => ({
      id: r.id,
      internalUrl: r.internal_url,
      alive: r.alive,
      scales: r.scales,
    }));
  }

  /**
   * Notes a silent hub as gone; true for the one hub that noted it (it then interrupts the gone
   * hub's open batches), false when it is alive again or another hub noted it first.
   */
  async noteDown(id: string, staleMs: number): Promise<boolean> {
    const rows = await this.database.rows<{ id: string }>(sql`
      update hubs set down_noted_at = now()
      where id = ${id}
        and heartbeat_at <= now() - make_interval(secs => ${staleMs / 1000})
        and (down_noted_at is null or down_noted_at < heartbeat_at)
      returning id`);
    return rows.length > 0;
  }
}
