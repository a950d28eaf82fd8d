import { useHealth } from '../api/get-health';

type Shown = { label: string; detail: string; dot: string };

/** Whether the hub and its database answer; shown in the header on every page. */
export function HubStatus() {
  const { data, isPending, isError } = useHealth();
  let shown: Shown;
  if (isPending) {
    shown = { label: 'Hub: checking', detail: 'Asking the hub…', dot: 'bg-line' };
  } else if (isError || !data) {
    shown = { label: 'Hub: not reachable', detail: 'The hub does not answer', dot: 'bg-over' };
  } else if (data.status === 'ok') {
    shown = {
      label: 'Hub: connected',
      detail: `Version ${data.version}, database ok`,
      dot: 'bg-go',
    };
  } else {
    shown = {
      label: 'Hub: database problem',
      detail: data.db.detail ?? 'The database does not answer',
      dot: 'bg-brass',
    };
  }
  return (
    <div
      role="status"
      aria-live="polite"
      title={shown.detail}
      className="flex items-center gap-2 text-sm font-medium"
    >
      <span aria-hidden="true" className={`inline-block h-3 w-3 rounded-full ${shown.dot}`} />
      <span>{shown.label}</span>
    </div>
  );
}
