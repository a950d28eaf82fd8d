import { Readable } from 'node:stream';
import { Inject, Injectable } from '@nestjs/common';
import type {
  AccuracyAnswer,
  Batch,
  BatchPage,
  BatchSort,
  BatchSummary,
  CreateDisposition,
  DispositionDecision,
} from '@tareline/protocol';
import { roundCents } from '@tareline/protocol';
import { stringify } from 'csv-stringify';
import { AuditRepository } from '../audit/audit.repository.js';
import type { AuthUser } from '../auth/auth-user.js';
import { SignInService } from '../auth/sign-in.service.js';
import { CLOCK, type Clock } from '../common/clock.js';
import { Conflict, InvalidInput, NotAllowed } from '../common/domain-errors.js';
import {
  BatchDeskRepository,
  type AccuracyQuery,
  type BatchSearch,
  type SearchRow,
} from './batch-desk.repository.js';
import { recordOf, toBatch } from './batches.repository.js';
import { BatchesService } from './batches.service.js';

/** The filters of a list or export, as the query schema gives them. */
export type DeskFilter = Omit<BatchSearch, 'after' | 'limit'>;

const EXPORT_PAGE = 500;
const PART_NAMES = ['A', 'B', 'C'] as const;

// What a cursor's key looks like as PostgreSQL prints it, by sort: anything else is refused
// before it reaches the database (where it would fail as a cast).
const TIMESTAMP_TEXT = /^\d{4}-\d\d-\d\d \d\d:\d\d:\d\d(\.\d{1,6})?[+-]\d\d(:\d\d){0,2}$/;
const NUMBER_TEXT = /^-?\d+(\.\d+)?(e[+-]?\d+)?$/i;

function badCursor(): InvalidInput {
  return new InvalidInput('Not a cursor this list gave', [
    { path: 'cursor', message: 'Start again from the first page' },
  ]);
}

/** The cursor after a row: its sort, key and number, opaque to the station. */
export function encodeCursor(sort: BatchSort, last: SearchRow): string {
  return Buffer.from(JSON.stringify([sort, last.key, last.row.id])).toString('base64url');
}

export function decodeCursor(sort: BatchSort, cursor: string): { key: string | null; id: number } {
  let parsed: unknown;
  try {
    parsed = JSON.parse(Buffer.from(cursor, 'base64url').toString('utf8'));
  } catch {
    throw badCursor();
  }
  if (!Array.isArray(parsed) || parsed.length !== 3) throw badCursor();
  const [s, key, id] = parsed as unknown[];
  const keyShape = sort.endsWith('createdAt') ? TIMESTAMP_TEXT : NUMBER_TEXT;
  const keyOk =
    (key === null && !sort.endsWith('createdAt')) ||
    (typeof key === 'string' && key.length < 60 && keyShape.test(key));
  if (s !== sort || !keyOk || !Number.isSafeInteger(id) || (id as number) < 0) throw badCursor();
  return { key: key as string | null, id: id as number };
}

/**
 * The lead's desk: batches found by filter and sort a page at a time, exported as CSV, and
 * decided on (release, hold, scrap) with the decision signed by password and audited.
 */
@Injectable()
export class BatchDeskService {
  constructor(
    @Inject(BatchDeskRepository) private readonly repository: BatchDeskRepository,
    @Inject(BatchesService) private readonly batches: BatchesService,
    @Inject(SignInService) private readonly signIn: SignInService,
    @Inject(AuditRepository) private readonly audit: AuditRepository,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  /** A page of batches; an operator's are always their own bench's. */
  async search(
    filter: DeskFilter & { cursor?: string | undefined; limit: number },
    user: AuthUser,
  ): Promise<BatchPage> {
    const { cursor, ...rest } = filter;
    let search: BatchSearch = {
      ...stripUndefined(rest),
      ...(cursor ? { after: decodeCursor(filter.sort, cursor) } : {}),
    };
    if (user.role === 'operator') {
      if (search.benchId && search.benchId !== user.benchId) {
        throw new NotAllowed('Operators see only the batches of the bench they signed in at');
      }
      search = { ...search, benchId: user.benchId ?? '' };
    }
    const rows = await this.repository.search(search);
    const last = rows.at(-1);
    return {
      items: rows.map(toSummary),
      nextCursor: rows.length === filter.limit && last ? encodeCursor(filter.sort, last) : null,
    };
  }

  /** Every matching batch as CSV rows, read a page at a time so memory stays flat. */
  exportCsv(filter: DeskFilter): Readable {
    const repository = this.repository;
    const base = stripUndefined(filter);
    async function* pages(): AsyncGenerator<Record<string, string | number | null>> {
      let after: BatchSearch['after'];
      for (;;) {
        const rows = await repository.search({
          ...base,
          ...(after ? { after } : {}),
          limit: EXPORT_PAGE,
        });
        for (const r of rows) yield csvRow(toSummary(r));
        const last = rows.at(-1);
        if (rows.length < EXPORT_PAGE || !last) return;
        after = { key: last.key, id: last.row.id };
      }
    }
    return Readable.from(pages()).pipe(
      stringify({ header: true, columns: CSV_COLUMNS, record_delimiter: 'windows' }),
    );
  }

  /** Accuracy per group and day or week, for the trends a lead watches. */
  async accuracy(q: AccuracyQuery): Promise<AccuracyAnswer> {
    return { groupBy: q.groupBy, bucket: q.bucket, rows: await this.repository.accuracy(q) };
  }

  /** One batch with its trace and its decisions. */
  async detail(id: number, user: AuthUser): Promise<Batch> {
    const batch = await this.batches.get(id, user);
    const dispositions = await this.repository.dispositions(id);
    return { ...batch, disposition: dispositions.at(-1)?.decision ?? null, dispositions };
  }

  /**
   * Records a decision on a saved batch, signed with the lead's password, and its audit entry in
   * the same transaction. Earlier decisions stay: the latest one counts.
   */
  async decide(id: number, body: CreateDisposition, user: AuthUser): Promise<Batch> {
    const batch = await this.batches.get(id, user, false);
    if (batch.state !== 'saved') {
      throw new Conflict(`Batch ${id} is ${batch.state}: only a saved batch is decided on`);
    }
    await this.signIn.confirmPassword(user, body.password);
    const at = new Date(this.clock.now());
    const decision: DispositionDecision = body.decision;
    const reason = body.reason || null;
    await this.audit.record(
      (tx) =>
        this.repository.insertDisposition(tx, {
          batchId: id,
          decision,
          reason,
          byId: user.id,
          byName: user.name,
          at,
        }),
      () => ({
        at: at.toISOString(),
        actor: { id: user.id, name: user.name },
        entity: 'batch',
        entityId: String(id),
        action: `disposition.${decision}`,
        data: { decision, reason, verdict: batch.verdict },
      }),
    );
    return this.detail(id, user);
  }
}

function stripUndefined<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}

function toSummary(r: SearchRow): BatchSummary {
  const { active: _a, rescue: _r, trace: _t, ...batch } = toBatch(r.row, recordOf(r.row));
  return { ...batch, disposition: r.disposition, benchName: r.benchName };
}

const CSV_COLUMNS = [
  { key: 'number', header: 'number' },
  { key: 'createdAt', header: 'created (UTC)' },
  { key: 'savedAt', header: 'saved (UTC)' },
  { key: 'bench', header: 'bench' },
  { key: 'operator', header: 'operator' },
  { key: 'material', header: 'material' },
  { key: 'state', header: 'state' },
  { key: 'verdict', header: 'verdict' },
  { key: 'disposition', header: 'disposition' },
  ...PART_NAMES.flatMap((p) => [
    { key: `target${p}`, header: `part ${p} target g` },
    { key: `actual${p}`, header: `part ${p} actual g` },
  ]),
  { key: 'deviationPct', header: 'deviation %' },
  { key: 'tolerancePct', header: 'tolerance %' },
  ...PART_NAMES.map((p) => ({ key: `lot${p}`, header: `part ${p} lot` })),
  { key: 'readabilityG', header: 'readability g' },
  { key: 'costTotal', header: 'costTotal' },
];

function csvRow(b: BatchSummary): Record<string, string | number | null> {
  const row: Record<string, string | number | null> = {
    number: b.id,
    createdAt: b.createdAt,
    savedAt: b.savedAt,
    bench: b.benchName ?? b.benchId,
    operator: b.operator.name,
    material: b.materialName,
    state: b.state,
    verdict: b.verdict,
    disposition: b.disposition,
    // An abandoned batch has no deviation to show, whatever was poured.
    deviationPct: b.state === 'abandoned' ? null : b.ratioDeviationPct,
    tolerancePct: b.tolerancePct,
    readabilityG: b.readabilityG,
    costTotal: b.cost ? roundCents(b.cost.total) : null,
  };
  PART_NAMES.forEach((p, i) => {
    row[`target${p}`] = b.parts[i]?.targetG ?? null;
    row[`actual${p}`] = b.parts[i]?.actualG ?? null;
    row[`lot${p}`] = b.lots.find((l) => l.part === i)?.code ?? null;
  });
  return row;
}
