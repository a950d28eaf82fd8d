import { ALERT_EVENT_LABELS, type AlertEvent, type Batch } from '@tareline/protocol';

export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

/** Everything a batch alert names, gathered by the caller (the bench's name is not on the batch). */
export interface BatchAlertFacts {
  event: AlertEvent;
  batch: Batch;
  benchName: string;
  /** The hub's public address, without a trailing slash. */
  publicUrl: string;
}

const HTML_ESCAPES: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
};

/** Names and reasons are typed by people: never markup in a mail. */
export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]!);
}

const signed = (n: number, digits: number) => `${n >= 0 ? '+' : '−'}${Math.abs(n).toFixed(digits)}`;

/** The deviation of the mix from its ratio, against the band the material allows. */
export function deviationLine(batch: Batch): string {
  const band = `band ±${batch.tolerancePct.toFixed(1)} %`;
  if (batch.ratioDeviationPct === null) return `Deviation: not measured (${band})`;
  const outside = Math.abs(batch.ratioDeviationPct) > batch.tolerancePct;
  return `Deviation: ${signed(batch.ratioDeviationPct, 2)} % off ratio, ${band}${outside ? ', outside the band' : ', inside the band'}`;
}

export function batchLink(publicUrl: string, batchId: number): string {
  return `${publicUrl}/review/batches/${batchId}`;
}

/** Label, value pairs of a batch alert, shared by the text and HTML parts. */
function batchFacts(f: BatchAlertFacts): Array<[string, string]> {
  const b = f.batch;
  const facts: Array<[string, string]> = [
    ['Batch', `#${b.id}`],
    ['Bench', f.benchName],
    ['Operator', b.operator.name],
    ['Material', b.materialName],
    [
      'Lots',
      b.lots.length
        ? b.lots
            .map((lot) => {
              const warnings = lot.warnings.map((w) => w.message).join('; ');
              return `part ${String.fromCharCode(65 + lot.part)}: ${lot.code}${warnings ? ` (${warnings})` : ''}`;
            })
            .join(', ')
        : 'none recorded',
    ],
    b.verdict ? ['Verdict', b.verdict] : ['State', b.state],
    ['Deviation', deviationLine(b).replace(/^Deviation: /, '')],
  ];
  if (b.noGoReason) facts.push(['Why NO-GO', b.noGoReason]);
  if (b.abandonReason) facts.push(['Why abandoned', b.abandonReason]);
  if (b.interruptedReason) facts.push(['Why interrupted', b.interruptedReason]);
  return facts;
}

export function subjectOf(event: AlertEvent, batch: Batch, benchName: string): string {
  return `Tareline: ${ALERT_EVENT_LABELS[event]} - batch #${batch.id}, ${benchName}, ${batch.materialName}`;
}

/** The mail of one batch alert, plain text and HTML saying the same. */
export function renderBatchAlert(f: BatchAlertFacts): MailContent {
  const link = batchLink(f.publicUrl, f.batch.id);
  const facts = batchFacts(f);
  const heading = ALERT_EVENT_LABELS[f.event];
  const text = [
    heading,
    '',
    ...facts.map(([label, value]) => `${label}: ${value}`),
    '',
    `Open the batch: ${link}`,
    '',
  ].join('\n');
  const rows = facts
    .map(
      ([label, value]) =>
        `<tr><th align="left">${escapeHtml(label)}</th><td>${escapeHtml(value)}</td></tr>`,
    )
    .join('');
  const html = `<!doctype html><html><body><h1>${escapeHtml(heading)}</h1><table>${rows}</table><p><a href="${escapeHtml(link)}">Open batch #${f.batch.id}</a></p></body></html>`;
  return { subject: subjectOf(f.event, f.batch, f.benchName), text, html };
}

/** One mail instead of a flood: the subjects and links of the queued alerts, oldest first. */
export function renderDigest(items: ReadonlyArray<{ subject: string; text: string }>): MailContent {
  const subject = `Tareline: ${items.length} alerts`;
  const text = [
    `${items.length} alerts arrived in a short time; here they are in one mail.`,
    '',
    ...items.flatMap((item) => [`— ${item.subject}`, item.text, '']),
  ].join('\n');
  const html = `<!doctype html><html><body><h1>${escapeHtml(subject)}</h1>${items
    .map((item) => `<h2>${escapeHtml(item.subject)}</h2><pre>${escapeHtml(item.text)}</pre>`)
    .join('')}</body></html>`;
  return { subject, text, html };
}

/** A batch as the daily summary counts it. */
export interface BatchOutcome {
  id: number;
  state: string;
  verdict: string | null;
  benchId: string;
  materialName: string;
}

/** The leads' daily summary: batches finished in the last 24 hours, GO share, NO-GO batches. */
export function renderDailySummary(
  day: string,
  outcomes: readonly BatchOutcome[],
  publicUrl: string,
): MailContent {
  const saved = outcomes.filter((b) => b.state === 'saved');
  const go = saved.filter((b) => b.verdict === 'GO').length;
  const noGo = saved.filter((b) => b.verdict === 'NO-GO');
  const abandoned = outcomes.length - saved.length;
  const share = saved.length ? `${Math.round((go / saved.length) * 100)} % GO` : 'none saved';
  const subject = `Tareline daily summary ${day}: ${outcomes.length} ${outcomes.length === 1 ? 'batch' : 'batches'}, ${share}`;
  const lines = [
    `Batches finished in the last 24 hours: ${outcomes.length}`,
    `Saved: ${saved.length} (GO ${go}, NO-GO ${noGo.length}); abandoned: ${abandoned}`,
    `GO share of saved batches: ${share}`,
    '',
    noGo.length ? 'NO-GO batches to decide on:' : 'No NO-GO batches.',
    ...noGo.map(
      (b) => `  #${b.id} ${b.materialName} (${b.benchId}): ${batchLink(publicUrl, b.id)}`,
    ),
    '',
  ];
  const html = `<!doctype html><html><body><h1>${escapeHtml(subject)}</h1>${lines
    .slice(0, 3)
    .map((l) => `<p>${escapeHtml(l)}</p>`)
    .join('')}${
    noGo.length
      ? `<h2>NO-GO batches to decide on</h2><ul>${noGo
          .map(
            (b) =>
              `<li><a href="${escapeHtml(batchLink(publicUrl, b.id))}">#${b.id}</a> ${escapeHtml(b.materialName)} (${escapeHtml(b.benchId)})</li>`,
          )
          .join('')}</ul>`
      : '<p>No NO-GO batches.</p>'
  }</body></html>`;
  return { subject, text: lines.join('\n'), html };
}
