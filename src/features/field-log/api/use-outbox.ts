import { useCallback, useEffect, useState } from 'react';
import { useInvalidateTrial } from '@/lib/trial-keys';
import { type OutboxItem, sharedOutbox } from './outbox';

/** The outbox items of one trial, kept current; saved entries refresh every view of the records. */
export function useOutbox(trialSlug: string) {
  const outbox = sharedOutbox();
  const invalidate = useInvalidateTrial();
  const [items, setItems] = useState<OutboxItem[]>([]);
  const [online, setOnline] = useState(() => navigator.onLine);

  const refresh = useCallback(() => {
    void outbox.list(trialSlug).then(setItems);
  }, [outbox, trialSlug]);

  useEffect(() => {
    refresh();
    const unsubscribe = outbox.subscribe(refresh);
    const unsaved = outbox.whenSaved((item) => {
      if (item.trialSlug === trialSlug) void invalidate(trialSlug, 'records');
    });
    const on = () => setOnline(true);
    const off = () => setOnline(false);
    window.addEventListener('online', on);
    window.addEventListener('offline', off);
    return () => {
      unsubscribe();
      unsaved();
      window.removeEventListener('online', on);
      window.removeEventListener('offline', off);
    };
  }, [outbox, refresh, invalidate, trialSlug]);

  return {
    items,
    online,
    add: (entries: Parameters<typeof outbox.add>[0]) => outbox.add(entries),
    retryNow: () => outbox.retryNow(),
    discard: (id: string) => outbox.discard(id),
  };
}
