import type {
  AlertSubscription,
  Batch,
  OutboxMessage,
  CaughtMail,
  Material,
  Person,
} from '@tareline/protocol';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { DailySummary } from '../src/alerts/daily-summary.js';
import { OutboxSender } from '../src/alerts/outbox-sender.js';
import type { BatchRecord } from '../src/batches/batch-machine.js';
import {
  BatchesRepository,
  detailOf,
  recordOf,
  toBatch,
  type BatchRow,
} from '../src/batches/batches.repository.js';
import { MailCatcher } from '../src/alerts/mail-catcher.js';
import { CLOCK, type Clock } from '../src/common/clock.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { MIN, sampleBatch } from './support/sample-batch.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

const NOBODY = 'nobody@hollin-ridge.example';
// What the mail server answers for an address it does not know (the test's own server).
const NO_SUCH_MAILBOX = {
  code: 550,
  message: '5.1.1 <nobody@hollin-ridge.example>: no such mailbox here',
};

/** The test's mail server: a real SMTP server on a free loopback port that can go down and up. */
class TestMailServer {
  server = this.fresh();
  port = 0;
  /** Mails received across restarts of the server. */
  received: ReturnType<MailCatcher['list']> = [];

  private fresh() {
    return new MailCatcher({ refuse: (to) => (to === NOBODY ? NO_SUCH_MAILBOX : null) });
  }

  async up(): Promise<void> {
    this.server = this.fresh();
    this.port = await this.server.start(this.port);
  }

  async down(): Promise<void> {
    this.received.push(...this.server.list().reverse());
    await this.server.stop();
  }

  all() {
    return [...this.received, ...this.server.list().reverse()];
  }

  to(address: string) {
    return this.all().filter((m) => m.to.includes(address));
  }
}

/** The hubs' clock, stopped at a time the test moves on by hand (and kept across a restart). */
class HeldClock {
  private t = Date.now();

  hold(hub: TestHub): void {
    vi.spyOn(hub.app.get<Clock>(CLOCK), 'now').mockImplementation(() => this.t);
  }

  now(): number {
    return this.t;
  }

  advance(ms: number): void {
    this.t += ms;
  }
}

/** Starts a batch at bench-1 as an operator and abandons it; answers its number. */
async function startAndAbandon(hub: TestHub): Promise<number> {
  const joss = await badgeSignIn(hub, DEMO.joss.badge);
  const token = joss.body.token;
  const materials = await call<Material[]>(hub, 'GET', '/api/materials', { token });
  const sc14 = materials.body.find((m) => m.name.includes('SC-14'))!;
  const created = await call<Batch>(hub, 'POST', '/api/batches', {
    token,
    body: {
      benchId: 'bench-1',
      materialId: sc14.id,
      totalMassG: 114,
      lots: [
        { part: 0, code: 'SC14R-2609' },
        { part: 1, code: 'SC14H-2511' },
      ],
    },
  });
  expect(created.status).toBe(201);
  const abandoned = await call(hub, 'POST', `/api/batches/${created.body.id}/abandon`, {
    token,
    body: { reason: 'Cup tipped over' },
  });
  expect(abandoned.status).toBe(201);
  return created.body.id;
}

describe('alert mails through the durable outbox, to a real SMTP server', () => {
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let mail: TestMailServer;
  let hub: TestHub;
  let admin: string;
  let lead: string;
  const clock = new HeldClock();
  let nextBatchId = 9000;

  // Two hours after the test's start, in the hub's local time.
  const SUMMARY_HOUR = (new Date(clock.now()).getHours() + 2) % 24;

  async function startHub(): Promise<void> {
    hub = await startTestHub(data.dir, {
      TARELINE_SUMMARY_HOUR: String(SUMMARY_HOUR),
      TARELINE_SMTP_URL: `smtp://127.0.0.1:${mail.port}`,
      TARELINE_PUBLIC_URL: 'http://hub.hollin-ridge.example',
      TARELINE_SIGN_IN_LIMIT: '1000',
      // The tests move the hub's clock on by days; their sign-ins must outlast that.
      TARELINE_SESSION_HOURS: '720',
    });
    clock.hold(hub);
    admin = await login(hub, DEMO.admin.email, DEMO.admin.password);
    lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
  }

  let template: BatchRow;

  /**
   * Writes a batch's new state through the batch repository, as the batch rooms do (a new batch,
   * copied from a real one, when `batch.id` is not stored yet); answers the batch as stored.
   */
  async function store(batch: Batch): Promise<Batch> {
    const repo = hub.app.get(BatchesRepository);
    const row = (await repo.findById(batch.id)) ?? (await repo.insert(template));
    const rec: BatchRecord = {
      ...recordOf(row),
      state: batch.state,
      resumeState: batch.state === 'interrupted' ? 'weighing-b' : null,
      verdict: batch.verdict,
      ratioDeviationPct: batch.ratioDeviationPct,
      abandonReason: batch.abandonReason,
      interruptedReason: batch.interruptedReason,
      steps: batch.steps,
    };
    const written = await repo.writeRecord(row.id, rec, detailOf(row), []);
    return toBatch(written, recordOf(written));
  }

  /** A real batch, started and abandoned at the bench, whose row the stored batches copy. */
  async function makeTemplate(): Promise<BatchRow> {
    const id = await startAndAbandon(hub);
    return (await hub.app.get(BatchesRepository).findById(id))!;
  }

  const flush = () => hub.app.get(OutboxSender).flush();

  async function outboxFor(to: string): Promise<OutboxMessage[]> {
    const answer = await call<OutboxMessage[]>(hub, 'GET', '/api/outbox', { token: admin });
    expect(answer.status).toBe(200);
    return answer.body.filter((m) => m.to === to);
  }

  async function subscribe(token: string, events: string[]) {
    return call<AlertSubscription>(hub, 'PUT', '/api/me/alerts', { token, body: { events } });
  }

  beforeAll(async () => {
    data = await tempDataDir();
    mail = new TestMailServer();
    await mail.up();
    await startHub();
    template = await makeTemplate();
  });

  beforeEach(() => {
    nextBatchId += 1;
  });

  afterEach(async () => {
    await subscribe(admin, []);
    await subscribe(lead, ['batch.no-go']);
  });

  afterAll(async () => {
    await hub?.close();
    await mail?.down();
    await data?.remove();
  });

  it('gives leads NO-GO alerts and the daily summary by default and the others none, until they choose', async () => {
    const mine = await call<AlertSubscription>(hub, 'GET', '/api/me/alerts', { token: lead });
    expect(mine.body).toMatchObject({
      email: DEMO.lead.email,
      events: ['batch.no-go', 'summary.daily'],
    });
    const adminOwn = await call<AlertSubscription>(hub, 'GET', '/api/me/alerts', { token: admin });
    expect(adminOwn.body.events).toEqual([]);
    const chosen = await subscribe(admin, ['batch.abandoned', 'batch.no-go', 'batch.no-go']);
    expect(chosen.status).toBe(200);
    expect(chosen.body.events).toEqual(['batch.abandoned', 'batch.no-go']);
    const bad = await subscribe(admin, ['batch.exploded']);
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.body)).toContain('Must be one of');
  });

  it('lets an admin choose for someone else, and not a lead', async () => {
    const people = await call<Person[]>(hub, 'GET', '/api/people', { token: admin });
    const ilse = people.body.find((p) => p.email === DEMO.lead.email)!;
    const set = await call<AlertSubscription>(hub, 'PUT', `/api/people/${ilse.id}/alerts`, {
      token: admin,
      body: { events: ['batch.interrupted'] },
    });
    expect(set.body.events).toEqual(['batch.interrupted']);
    const seen = await call<AlertSubscription>(hub, 'GET', '/api/me/alerts', { token: lead });
    expect(seen.body.events).toEqual(['batch.interrupted']);
    const refused = await call(hub, 'PUT', `/api/people/${ilse.id}/alerts`, {
      token: lead,
      body: { events: [] },
    });
    expect(refused.status).toBe(403);
  });

  it('mails the daily summary once, in its hour: batches, GO share, NO-GO batches', async () => {
    await subscribe(lead, ['summary.daily']);
    await store(sampleBatch({ id: nextBatchId, verdict: 'GO', ratioDeviationPct: 0.4 }));
    const noGo = await store(sampleBatch({ id: nextBatchId + 5000 }));
    const summary = hub.app.get(DailySummary);
    expect(await summary.tick()).toBe(0); // not its hour yet
    while (new Date(clock.now()).getHours() !== SUMMARY_HOUR) clock.advance(10 * MIN);
    expect(await summary.tick()).toBe(1); // the lead; the admin did not ask for it
    expect(await summary.tick()).toBe(0);
    await flush();
    const got = mail.to(DEMO.lead.email).filter((m) => m.subject.startsWith('Tareline daily'));
    expect(got).toHaveLength(1);
    // The bench's abandoned batch and the two saved here: 1 GO of 2 saved.
    expect(got[0]!.subject).toMatch(/^Tareline daily summary \d{4}-\d\d-\d\d: 3 batches, 50 % GO$/);
    expect(got[0]!.text).toContain('Saved: 2 (GO 1, NO-GO 1); abandoned: 1');
    expect(got[0]!.text).toContain(
      `#${noGo.id} ${noGo.materialName} (bench-1): http://hub.hollin-ridge.example/review/batches/${noGo.id}`,
    );
    expect(mail.to(DEMO.admin.email).filter((m) => m.subject.startsWith('Tareline daily'))).toEqual(
      [],
    );
  });

  it('mails a NO-GO batch once to each subscriber and to nobody else', async () => {
    await subscribe(admin, ['batch.abandoned']); // not NO-GO: gets nothing
    const batch = await store(sampleBatch({ id: nextBatchId }));
    // The written row's alerts are in the outbox when the write returns: same transaction.
    expect(await outboxFor(DEMO.lead.email)).toContainEqual(
      expect.objectContaining({ subject: expect.stringContaining(`#${batch.id},`) }),
    );
    await store(batch); // the same state written twice: still one mail each
    await flush();
    const toLead = mail.to(DEMO.lead.email).filter((m) => m.subject.includes(`#${batch.id}`));
    expect(toLead).toHaveLength(1);
    expect(toLead[0]!.subject).toBe(
      `Tareline: A batch saved NO-GO - batch #${batch.id}, Bench 1, ${batch.materialName}`,
    );
    expect(toLead[0]!.text).toContain(
      `Open the batch: http://hub.hollin-ridge.example/review/batches/${batch.id}`,
    );
    expect(toLead[0]!.text).toContain(
      `+3.20 % off ratio, band ±${batch.tolerancePct.toFixed(1)} %, outside the band`,
    );
    expect(mail.to(DEMO.admin.email).filter((m) => m.subject.includes(`#${batch.id}`))).toEqual([]);
    expect(await outboxFor(DEMO.lead.email)).toContainEqual(
      expect.objectContaining({ status: 'sent', attempts: 1, lastError: null }),
    );
  });

  it('stores no alert when the batch write it belongs to is rolled back', async () => {
    const repo = hub.app.get(BatchesRepository);
    const fresh = await repo.insert(template);
    // A later part of the same write fails (as a full disk would): the whole transaction goes.
    let failing = true;
    repo.onRecordWrite(async () => {
      if (failing) throw new Error('disk full');
    });
    try {
      await expect(store(sampleBatch({ id: fresh.id }))).rejects.toThrow('disk full');
    } finally {
      failing = false;
    }
    expect((await repo.findById(fresh.id))!.state).toBe(template.state);
    const rows = await outboxFor(DEMO.lead.email);
    expect(rows.filter((m) => m.subject.includes(`#${fresh.id},`))).toEqual([]);
  });

  it('keeps a mail while the SMTP server is down and sends it once when it is back', async () => {
    await subscribe(admin, ['batch.abandoned']);
    await mail.down();
    const batch = await store(
      sampleBatch({
        id: nextBatchId,
        state: 'abandoned',
        verdict: null,
        abandonReason: 'Cup tipped over',
      }),
    );
    await flush();
    const [queued] = await outboxFor(DEMO.admin.email);
    expect(queued).toMatchObject({ status: 'queued', attempts: 1 });
    expect(queued!.lastError).toMatch(/ECONNREFUSED/);

    await mail.up();
    await flush(); // not yet: the retry waits a minute
    expect(mail.to(DEMO.admin.email)).toEqual([]);
    clock.advance(1 * MIN);
    await flush();
    clock.advance(60 * MIN);
    await flush();
    const got = mail.to(DEMO.admin.email).filter((m) => m.subject.includes(`#${batch.id}`));
    expect(got).toHaveLength(1);
    expect(got[0]!.subject).toContain('A batch abandoned');
    expect((await outboxFor(DEMO.admin.email))[0]).toMatchObject({ status: 'sent', attempts: 2 });
  });

  it('marks a mail to an address the server refuses failed, in the server’s words, at once', async () => {
    const created = await call<Person>(hub, 'POST', '/api/people', {
      token: admin,
      body: { name: 'Nobody Here', role: 'lead', email: NOBODY, password: 'nobody-here-pw' },
    });
    expect(created.status).toBe(201);
    await store(sampleBatch({ id: nextBatchId }));
    await flush();
    const [row] = await outboxFor(NOBODY);
    expect(row).toMatchObject({ status: 'failed', attempts: 1, nextAttemptAt: null });
    expect(row!.lastError).toContain(
      '550 5.1.1 <nobody@hollin-ridge.example>: no such mailbox here',
    );
    await call(hub, 'PATCH', `/api/people/${created.body.id}`, {
      token: admin,
      body: { active: false },
    });
  });

  it('gives up after a day of retries with the last error, when the server never comes back', async () => {
    await subscribe(admin, ['batch.abandoned']);
    await mail.down();
    const batch = await store(sampleBatch({ id: nextBatchId, state: 'abandoned', verdict: null }));
    for (let hour = 0; hour < 26; hour += 1) {
      await flush();
      clock.advance(60 * MIN);
    }
    await flush();
    const [row] = (await outboxFor(DEMO.admin.email)).filter((m) =>
      m.subject.includes(`#${batch.id}`),
    );
    // Tries at 0, 1, 6, 36 minutes, then hourly (the passes here run on the hour) for 24 hours.
    expect(row).toMatchObject({ status: 'failed', nextAttemptAt: null });
    expect(row!.attempts).toBeGreaterThan(20);
    expect(row!.lastError).toMatch(/ECONNREFUSED/);
    await mail.up();
    await flush();
    expect(mail.to(DEMO.admin.email).filter((m) => m.subject.includes(`#${batch.id}`))).toEqual([]);
  });

  it('mails an interruption only when nobody resumed the batch within 15 minutes', async () => {
    await subscribe(admin, ['batch.interrupted']);
    const at = (ms: number) => new Date(ms).toISOString();
    const start = clock.now();
    const { id } = await store(
      sampleBatch({
        id: nextBatchId,
        state: 'interrupted',
        verdict: null,
        steps: { interrupted: at(start) },
      }),
    );
    clock.advance(10 * MIN);
    await store(
      sampleBatch({
        id,
        state: 'weighing-b',
        verdict: null,
        steps: { interrupted: at(start), resumed: at(start + 10 * MIN) },
      }),
    );
    clock.advance(10 * MIN);
    const again = start + 20 * MIN;
    await store(
      sampleBatch({
        id,
        state: 'interrupted',
        verdict: null,
        steps: { interrupted: at(start), 'interrupted.2': at(again) },
      }),
    );
    await flush();
    clock.advance(14 * MIN);
    await flush();
    expect(mail.to(DEMO.admin.email).filter((m) => m.subject.includes(`#${id}`))).toEqual([]);
    clock.advance(1 * MIN);
    await flush();
    const got = mail.to(DEMO.admin.email).filter((m) => m.subject.includes(`#${id}`));
    expect(got).toHaveLength(1);
    expect(got[0]!.subject).toContain('not resumed within 15 minutes');
  });

  it('sends one digest instead of a flood past 10 alerts in 10 minutes', async () => {
    await subscribe(admin, ['batch.abandoned']);
    clock.advance(60 * MIN); // clear of the earlier tests' alerts
    const before = mail.to(DEMO.admin.email).length;
    const ids: number[] = [];
    for (let n = 0; n < 14; n += 1) {
      nextBatchId += 1;
      const stored = await store(
        sampleBatch({ id: nextBatchId, state: 'abandoned', verdict: null }),
      );
      ids.push(stored.id);
      await flush();
    }
    expect(mail.to(DEMO.admin.email).length - before).toBe(10);
    clock.advance(10 * MIN);
    await flush();
    const fresh = mail.to(DEMO.admin.email).slice(before);
    expect(fresh).toHaveLength(11);
    expect(fresh[10]!.subject).toBe('Tareline: 4 alerts');
    for (const id of ids.slice(10)) expect(fresh[10]!.text).toContain(`batch #${id}`);
  });

  it('sends after a restart what was queued when the hub stopped, once', async () => {
    await subscribe(admin, ['batch.no-go']);
    clock.advance(60 * MIN); // clear of the digest test's flood
    await mail.down();
    const batch = await store(sampleBatch({ id: nextBatchId }));
    await flush();
    expect((await outboxFor(DEMO.admin.email))[0]).toMatchObject({ status: 'queued' });
    await hub.close();
    await mail.up();
    await startHub();
    clock.advance(2 * MIN);
    await flush();
    await flush();
    const got = mail.to(DEMO.admin.email).filter((m) => m.subject.includes(`#${batch.id}`));
    expect(got).toHaveLength(1);
  });
});

describe('the local mail catcher, with no SMTP server configured', () => {
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let hub: TestHub;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  it('catches the mail of a batch abandoned at the bench, and shows it to an admin', async () => {
    const admin = await login(hub, DEMO.admin.email, DEMO.admin.password);
    await call(hub, 'PUT', '/api/me/alerts', {
      token: admin,
      body: { events: ['batch.abandoned'] },
    });
    const id = await startAndAbandon(hub);

    // Sent in the background once the batch is announced: wait until it went.
    let outbox: OutboxMessage[] = [];
    for (let tries = 0; tries < 200 && !outbox.some((m) => m.status === 'sent'); tries += 1) {
      await hub.app.get(OutboxSender).flush();
      outbox = (await call<OutboxMessage[]>(hub, 'GET', '/api/outbox', { token: admin })).body;
      if (!outbox.length) await new Promise((r) => setTimeout(r, 25));
    }
    expect(outbox).toEqual([
      expect.objectContaining({ to: DEMO.admin.email, status: 'sent', event: 'batch.abandoned' }),
    ]);
    const caught = await call<CaughtMail[]>(hub, 'GET', '/api/mail-catcher', { token: admin });
    expect(caught.status).toBe(200);
    expect(caught.body).toHaveLength(1);
    expect(caught.body[0]).toMatchObject({
      to: [DEMO.admin.email],
      subject: `Tareline: A batch abandoned - batch #${id}, Bench 1, Grey surface-coat epoxy SC-14`,
    });
    expect(caught.body[0]!.text).toContain('Why abandoned: Cup tipped over');
    expect(caught.body[0]!.text).toContain('Operator: Joss Whitcombe');
    const lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
    expect((await call(hub, 'GET', '/api/mail-catcher', { token: lead })).status).toBe(403);
  });
});
