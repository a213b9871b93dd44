import { useCallback, useEffect, useState } from 'react';
import { useMe } from '@/lib/session';
import { useInvalidateTrial } from '@/lib/trial-keys';
import { type NewOutboxItem, type OutboxItem, sharedOutbox } from './outbox';

/**
 * The outbox items of one trial, kept current; saved entries refresh every view of the
 * records. New entries are kept under the signed-in account, and a change of account sends
 * what now may go.
 */
export function useOutbox(trialSlug: string) {
  const outbox = sharedOutbox();
  const invalidate = useInvalidateTrial();
  const me = useMe();
  const account = me.data ? { id: me.data.id, name: me.data.name } : null;
  const [items, setItems] = useState<OutboxItem[]>([]);
  const [online, setOnline] = useState(() => navigator.onLine);

  const refresh = useCallback(() => {
    void outbox.list(trialSlug).then(setItems);
  }, [outbox, trialSlug]);

  useEffect(() => {
    if (account?.id) void outbox.retryNow();
  }, [outbox, account?.id]);

  useEffect(() => {
    refresh();
    const unsubscribe = outbox.subscribe(refresh);
    const unsaved = outbox.whenSaved((item) => {
      if (item.trialSlug === trialSlug)
        void invalidate(trialSlug, item.kind === 'photo' ? 'photos' : 'records');
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
    account,
    add: (entries: NewOutboxItem[]) => {
      if (!account) throw new Error('Sign in to keep entries on this device.');
      return outbox.add(entries, account);
    },
    retryNow: () => outbox.retryNow(),
    discard: (id: string) => outbox.discard(id),
  };
}
