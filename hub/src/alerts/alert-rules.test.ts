import { describe, expect, it } from 'vitest';
import {
  alertsFor,
  GIVE_UP_AFTER_MS,
  INTERRUPTED_GRACE_MS,
  nextAttemptAfterFailure,
} from './alert-rules.js';
import { deviationLine, renderBatchAlert, renderDailySummary } from './alert-mail.js';
import { MIN, NOW, sampleBatch } from '../../test/support/sample-batch.js';

describe('which batch changes are worth a mail', () => {
  it('a NO-GO save, once per batch', () => {
    expect(alertsFor(sampleBatch(), NOW)).toEqual([
      { event: 'batch.no-go', key: 'batch:41:no-go', notBefore: NOW },
    ]);
  });

  it('nothing for a GO save with good lots, or a batch still being weighed', () => {
    expect(alertsFor(sampleBatch({ verdict: 'GO' }), NOW)).toEqual([]);
    expect(alertsFor(sampleBatch({ state: 'weighing-b', verdict: null }), NOW)).toEqual([]);
  });

  it('a save with an expired or long-open lot, not with an unknown lot', () => {
    const lots = (code: 'LOT_EXPIRED' | 'LOT_LONG_OPEN' | 'LOT_UNKNOWN') => [
      { part: 0, code: 'X', lotId: null, warnings: [{ code, message: 'm' }] },
    ];
    for (const code of ['LOT_EXPIRED', 'LOT_LONG_OPEN'] as const) {
      expect(alertsFor(sampleBatch({ verdict: 'GO', lots: lots(code) }), NOW)).toEqual([
        { event: 'batch.lot-warning', key: 'batch:41:lot-warning', notBefore: NOW },
      ]);
    }
    expect(alertsFor(sampleBatch({ verdict: 'GO', lots: lots('LOT_UNKNOWN') }), NOW)).toEqual([]);
  });

  it('an abandoned batch', () => {
    expect(alertsFor(sampleBatch({ state: 'abandoned', verdict: null }), NOW)[0]?.event).toBe(
      'batch.abandoned',
    );
  });

  it('an interruption, 15 minutes after the latest one, each interruption its own event', () => {
    const first = new Date(NOW - 40 * MIN).toISOString();
    const second = new Date(NOW - 2 * MIN).toISOString();
    const [alert] = alertsFor(
      sampleBatch({
        state: 'interrupted',
        verdict: null,
        steps: { interrupted: first, resumed: first, 'interrupted.2': second },
      }),
      NOW,
    );
    expect(alert).toEqual({
      event: 'batch.interrupted',
      key: `batch:41:interrupted:${NOW - 2 * MIN}`,
      notBefore: NOW - 2 * MIN + INTERRUPTED_GRACE_MS,
    });
  });
});

describe('retry backoff', () => {
  it('waits 1, 5 and 30 minutes, then an hour, and gives up after a day', () => {
    const first = NOW;
    expect(nextAttemptAfterFailure(1, first, first)).toBe(first + 1 * MIN);
    expect(nextAttemptAfterFailure(2, first, first + 1 * MIN)).toBe(first + 6 * MIN);
    expect(nextAttemptAfterFailure(3, first, first + 6 * MIN)).toBe(first + 36 * MIN);
    expect(nextAttemptAfterFailure(4, first, first + 36 * MIN)).toBe(first + 96 * MIN);
    expect(nextAttemptAfterFailure(9, first, first + 20 * 60 * MIN)).toBe(first + 21 * 60 * MIN);
    expect(nextAttemptAfterFailure(30, first, first + GIVE_UP_AFTER_MS - 30 * MIN)).toBeNull();
  });
});

describe('the alert mail', () => {
  it('names batch, bench, operator, material, lots, the deviation against the band and the link', () => {
    const mail = renderBatchAlert({
      event: 'batch.no-go',
      batch: sampleBatch(),
      benchName: 'Bench 1',
      publicUrl: 'http://hub.hollin-ridge.example',
    });
    expect(mail.subject).toBe(
      'Tareline: A batch saved NO-GO - batch #41, Bench 1, SC-14 <casting> resin',
    );
    for (const part of [mail.text, mail.html]) {
      expect(part).toContain('#41');
      expect(part).toContain('Bench 1');
      expect(part).toContain('Joss Whitcombe');
      expect(part).toContain('SC14R-2609');
      expect(part).toContain('+3.20 % off ratio, band ±2.0 %, outside the band');
      expect(part).toContain('http://hub.hollin-ridge.example/review/batches/41');
    }
    // A typed name is text in the HTML part, never markup.
    expect(mail.html).toContain('SC-14 &lt;casting&gt; resin');
    expect(mail.html).not.toContain('<casting>');
  });

  it('says when a deviation was not measured', () => {
    expect(deviationLine(sampleBatch({ ratioDeviationPct: null }))).toBe(
      'Deviation: not measured (band ±2.0 %)',
    );
  });
});

describe('the daily summary', () => {
  it('says when nothing was saved instead of a GO share of nothing', () => {
    const mail = renderDailySummary(
      '2026-12-02',
      [{ id: 7, state: 'abandoned', verdict: null, benchId: 'bench-1', materialName: 'SC-14' }],
      'http://hub',
    );
    expect(mail.subject).toBe('Tareline daily summary 2026-12-02: 1 batch, none saved');
    expect(mail.text).toContain('No NO-GO batches.');
  });
});
