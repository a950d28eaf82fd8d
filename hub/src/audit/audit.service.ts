import { Inject, Injectable, Logger } from '@nestjs/common';
import type { AuditPage, AuditVerify } from '@tareline/protocol';
import { CLOCK, type Clock } from '../common/clock.js';
import { InvalidInput } from '../common/domain-errors.js';
import { OnHubEvent, type HubEventMap } from '../events/hub-events.js';
import { firstBroken, GENESIS_HASH } from './audit-chain.js';
import { AuditRepository } from './audit.repository.js';

const VERIFY_PAGE = 1000;

/**
 * The audit trail: what changed on records of consequence, by whom, chained by hashes so that an
 * entry changed or removed behind the hub's back is found by {@link verify}. Dispositions append
 * in their own transaction (through the repository); batch states are heard on `batch.changed`.
 */
@Injectable()
export class AuditService {
  private readonly logger = new Logger('Audit');

  constructor(
    @Inject(AuditRepository) private readonly repository: AuditRepository,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  /**
   * A batch's state or verdict changed. The entry's actor is the person who acted when the event
   * says (`by`), else none (the hub itself saved it); its data names the batch's operator. Steps
   * within a state (a tare, a confirmed part
   * that keeps the state) are in the batch record itself, not here.
   */
  @OnHubEvent('batch.changed')
  async onBatchChanged(event: HubEventMap['batch.changed']): Promise<void> {
    const batch = event.batch;
    if (!batch) return;
    const data = {
      state: batch.state,
      verdict: batch.verdict,
      ratioDeviationPct: batch.ratioDeviationPct,
      benchId: batch.benchId,
      operator: batch.operator,
    };
    try {
      await this.repository.appendUnlessSame(
        {
          at: new Date(this.clock.now()).toISOString(),
          actor: event.by ? { id: event.by.id, name: event.by.name } : null,
          entity: 'batch',
          entityId: String(batch.id),
          action: `state.${batch.state}`,
          data,
        },
        (latest) => {
          const d = latest.data as Partial<typeof data> | null;
          return (
            latest.action.startsWith('state.') &&
            d?.state === data.state &&
            d.verdict === data.verdict
          );
        },
      );
    } catch (err) {
      // The batch itself is stored; a missing audit line is logged for someone to look at.
      this.logger.error(`Batch ${batch.id}: audit entry not written: ${String(err)}`);
    }
  }

  async list(q: {
    entity?: string | undefined;
    entityId?: string | undefined;
    cursor?: string | undefined;
    limit: number;
  }): Promise<AuditPage> {
    const afterId = q.cursor === undefined ? undefined : Number(q.cursor);
    if (afterId !== undefined && !(Number.isSafeInteger(afterId) && afterId >= 0)) {
      throw new InvalidInput('Not a cursor this list gave', [
        { path: 'cursor', message: 'Not a cursor this list gave' },
      ]);
    }
    const entries = await this.repository.list({
      ...(q.entity ? { entity: q.entity } : {}),
      ...(q.entityId ? { entityId: q.entityId } : {}),
      ...(afterId !== undefined ? { afterId } : {}),
      limit: q.limit,
    });
    const last = entries.at(-1);
    return {
      items: entries,
      nextCursor: entries.length === q.limit && last ? String(last.id) : null,
    };
  }

  /** Recomputes the whole chain, a page at a time so memory stays flat. */
  async verify(): Promise<AuditVerify> {
    let checked = 0;
    let prevHash = GENESIS_HASH;
    let afterId: number | undefined;
    for (;;) {
      const page = await this.repository.list({
        ...(afterId !== undefined ? { afterId } : {}),
        limit: VERIFY_PAGE,
      });
      const { brokenId, lastHash } = firstBroken(page, prevHash);
      if (brokenId !== null) {
        checked += page.findIndex((e) => e.id === brokenId) + 1;
        return { ok: false, checked, firstBrokenId: brokenId };
      }
      checked += page.length;
      if (page.length < VERIFY_PAGE) return { ok: true, checked, firstBrokenId: null };
      prevHash = lastHash;
      afterId = page.at(-1)!.id;
    }
  }
}
