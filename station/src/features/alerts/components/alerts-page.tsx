import { ALERT_EVENT_LABELS, ALERT_EVENTS, type AlertEvent } from '@tareline/protocol';
import { useState, type FormEvent } from 'react';
import { hasRole, useSession } from '../../../lib/auth';
import { dateTimeText } from '../../../lib/dates';
import { useCaughtMail } from '../api/mail-catcher';
import { useMyAlerts, useSetMyAlerts } from '../api/my-alerts';
import { useOutbox } from '../api/outbox';

const primary = 'min-h-11 rounded-lg bg-steel px-4 font-semibold text-paper';
const when = dateTimeText;

/** My alert mails for everyone; the outbox and the local mail catcher for admins. */
export function AlertsPage() {
  const session = useSession();
  const admin = hasRole(session, ['admin']);
  return (
    <section aria-labelledby="alerts-title" className="mx-auto flex max-w-5xl flex-col gap-8">
      <h1 id="alerts-title" className="text-3xl font-bold">
        Alerts
      </h1>
      <MyAlertsForm />
      {admin && <OutboxTable />}
      {admin && <CaughtMail />}
    </section>
  );
}

function MyAlertsForm() {
  const mine = useMyAlerts();
  const save = useSetMyAlerts();
  const [picked, setPicked] = useState<AlertEvent[] | null>(null);
  const events = picked ?? mine.data?.events ?? [];

  function toggle(event: AlertEvent, on: boolean) {
    setPicked(on ? [...events, event] : events.filter((e) => e !== event));
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    save.mutate(events, { onSuccess: () => setPicked(null) });
  }

  if (mine.isPending) return <p>Loading your alerts…</p>;
  if (mine.error) return <p role="alert">Could not load your alerts: {mine.error.message}</p>;
  return (
    <form aria-label="My alerts" onSubmit={submit} className="flex flex-col gap-3 bg-panel p-4">
      <h2 className="text-xl font-bold">My alerts</h2>
      {mine.data.email ? (
        <p>Mails go to {mine.data.email}.</p>
      ) : (
        <p>You have no e-mail address; an admin can add one on the people page.</p>
      )}
      <fieldset className="flex flex-col gap-2">
        <legend className="sr-only">Mail me when</legend>
        {ALERT_EVENTS.map((event) => (
          <label key={event} className="flex min-h-11 items-center gap-3">
            <input
              type="checkbox"
              className="size-6"
              checked={events.includes(event)}
              onChange={(e) => toggle(event, e.target.checked)}
            />
            {ALERT_EVENT_LABELS[event]}
          </label>
        ))}
      </fieldset>
      <div className="flex items-center gap-4">
        <button type="submit" className={primary} disabled={save.isPending}>
          Save my alerts
        </button>
        {save.isSuccess && picked === null && <p role="status">Your alerts are saved</p>}
        {save.error && <p role="alert">Not saved: {save.error.message}</p>}
      </div>
    </form>
  );
}

function OutboxTable() {
  const outbox = useOutbox();
  return (
    <section aria-labelledby="outbox-title" className="flex flex-col gap-3">
      <h2 id="outbox-title" className="text-xl font-bold">
        Outbox
      </h2>
      {outbox.error && <p role="alert">Could not load the outbox: {outbox.error.message}</p>}
      {outbox.data?.length === 0 && <p>No alert mails yet.</p>}
      {!!outbox.data?.length && (
        <table aria-label="Outbox" className="w-full border-collapse bg-panel text-left">
          <thead>
            <tr className="border-b-2 border-line">
              <th className="p-2">Subject</th>
              <th className="p-2">To</th>
              <th className="p-2">Status</th>
              <th className="p-2">Attempts</th>
              <th className="p-2">Next try</th>
              <th className="p-2">Last error</th>
            </tr>
          </thead>
          <tbody>
            {outbox.data.map((m) => (
              <tr key={m.id} className="border-b border-line">
                <td className="p-2">{m.subject}</td>
                <td className="p-2">{m.to}</td>
                <td className="p-2 font-semibold">{m.status}</td>
                <td className="p-2">{m.attempts}</td>
                <td className="p-2">{when(m.nextAttemptAt)}</td>
                <td className="p-2">{m.lastError ?? ''}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}

function CaughtMail() {
  const caught = useCaughtMail();
  return (
    <section aria-labelledby="caught-title" className="flex flex-col gap-3">
      <h2 id="caught-title" className="text-xl font-bold">
        Local mail catcher
      </h2>
      {caught.error && <p>{caught.error.message}</p>}
      {caught.data?.length === 0 && (
        <p>Nothing caught yet. With no mail server set, alert mails arrive here.</p>
      )}
      {caught.data?.map((mail) => (
        <article key={mail.id} aria-label={mail.subject} className="bg-panel p-4">
          <h3 className="font-bold">{mail.subject}</h3>
          <p>
            To {mail.to.join(', ')} · {when(mail.receivedAt)}
          </p>
          <pre className="mt-2 whitespace-pre-wrap">{mail.text}</pre>
        </article>
      ))}
    </section>
  );
}
