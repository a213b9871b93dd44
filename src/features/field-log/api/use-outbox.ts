import { useQueryClient } from '@tanstack/react-query';
import { useCallback, useEffect, useState } from 'react';
import { recordKeys } from '@/lib/record-keys';
import { type OutboxItem, sharedOutbox } from './outbox';

/** The outbox items of one trial, kept current; saved entries refresh the record tables. */
export function useOutbox(trialSlug: string) {
  const outbox = sharedOutbox();
  const queryClient = useQueryClient();
  const [items, setItems] = useState<OutboxItem[]>([]);
  const [online, setOnline] = useState(() => navigator.onLine);

  const refresh = useCallback(() => {
    void outbox.list(trialSlug).then(setItems);
  }, [outbox, trialSlug]);

  useEffect(() => {
    refresh();
    const unsubscribe = outbox.subscribe(refresh);
    const unsaved = outbox.whenSaved((item) => {
      if (item.trialSlug === trialSlug)
        void queryClient.invalidateQueries({ queryKey: recordKeys.all(trialSlug) });
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
  }, [outbox, refresh, queryClient, trialSlug]);

  return {
    items,
    online,
    add: (entries: Parameters<typeof outbox.add>[0]) => outbox.add(entries),
    retryNow: () => outbox.retryNow(),
    discard: (id: string) => outbox.discard(id),
  };
}
