import type { OutboxItem } from '../api/outbox';
import type { useOutbox } from '../api/use-outbox';

const stateLabel: Record<OutboxItem['state'], string> = {
  waiting: 'Waiting',
  sending: 'Sending',
  saved: 'Saved',
  refused: 'Refused',
};
const stateClass: Record<OutboxItem['state'], string> = {
  waiting: 'bg-straw-200 text-loam-700',
  sending: 'bg-pod-500/30 text-ink',
  saved: 'bg-leaf-100 text-leaf-900',
  refused: 'bg-frost-600 text-white',
};

/** The entries on this device and where each one stands. */
export function OutboxPanel({
  items,
  online,
  accountId,
  onRetry,
  onDiscard,
}: {
  items: OutboxItem[];
  online: boolean;
  /** the signed-in account: others' entries wait for their owner */
  accountId?: string | null;
  onRetry: () => void;
  onDiscard: (id: string) => void;
}) {
  const count = (s: OutboxItem['state']) => items.filter((i) => i.state === s).length;
  const pending = count('waiting') + count('sending');
  // Entries queued by someone else on this phone, by name, with how many wait for each.
  const othersWaiting = [
    ...items
      .filter((i) => i.state === 'waiting' && i.accountId && i.accountId !== accountId)
      .reduce(
        (m, i) => m.set(i.accountName, (m.get(i.accountName) ?? 0) + 1),
        new Map<string, number>(),
      ),
  ];
  return (
    <section aria-labelledby="outbox-heading" className="rounded-xl bg-white p-3 shadow-sm">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="outbox-heading" className="text-lg font-semibold text-leaf-900">
          Entries on this device
        </h2>
        <button
          type="button"
          onClick={onRetry}
          disabled={pending === 0}
          className="min-h-11 rounded-lg border border-leaf-700 px-3 font-semibold text-leaf-700 disabled:opacity-50"
        >
          Send now
        </button>
      </div>
      <p role="status" aria-live="polite" className="mt-1 text-sm" data-testid="outbox-summary">
        {online ? 'Online' : 'Offline: entries are kept here and sent when the signal returns'} ·{' '}
        {count('waiting')} waiting · {count('sending')} sending · {count('saved')} saved ·{' '}
        {count('refused')} refused
      </p>
      {othersWaiting.map(([name, n]) => (
        <p key={name} className="mt-1 rounded-lg bg-straw-100 p-2 text-sm text-loam-700">
          {n} {n === 1 ? 'entry waits' : 'entries wait'} for {name} to sign in again on this device;{' '}
          {n === 1 ? 'it is' : 'they are'} never sent under another account.
        </p>
      ))}
      {items.length ? (
        <ul
          aria-label="Entries on this device"
          tabIndex={0}
          className="mt-2 max-h-72 divide-y divide-leaf-50 overflow-y-auto"
        >
          {items.map((item) => (
            <li key={item.id} className="flex flex-wrap items-center gap-2 py-2 text-sm">
              <span
                className={`rounded-full px-2 py-0.5 text-xs font-semibold ${stateClass[item.state]}`}
              >
                {stateLabel[item.state]}
              </span>
              <span className="min-w-0 flex-1">{item.label}</span>
              {item.state === 'sending' && item.progress !== undefined ? (
                <progress
                  max={1}
                  value={item.progress}
                  aria-label={`Sending ${item.label}`}
                  className="w-full"
                >
                  {Math.round(item.progress * 100)}%
                </progress>
              ) : null}
              {item.message ? (
                <span
                  className={`w-full ${item.state === 'refused' ? 'text-frost-600' : 'text-loam-700'}`}
                >
                  {item.message}
                </span>
              ) : null}
              {item.state === 'refused' ? (
                <button
                  type="button"
                  onClick={() => onDiscard(item.id)}
                  className="min-h-11 rounded-lg px-2 text-leaf-700 underline"
                >
                  Dismiss
                </button>
              ) : null}
            </li>
          ))}
        </ul>
      ) : (
        <p className="mt-2 text-sm text-loam-700">Nothing entered yet on this device.</p>
      )}
    </section>
  );
}

/** The panel for a field-log page's own outbox (`useOutbox`). */
export function DeviceOutbox({ outbox }: { outbox: ReturnType<typeof useOutbox> }) {
  return (
    <OutboxPanel
      items={outbox.items}
      online={outbox.online}
      accountId={outbox.account?.id ?? null}
      onRetry={() => void outbox.retryNow()}
      onDiscard={(id) => void outbox.discard(id)}
    />
  );
}
