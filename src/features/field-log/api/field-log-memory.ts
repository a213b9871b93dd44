/**
 * What the field log remembers on this device so a round takes fewer taps: the grower's site
 * (per account and trial, for as long as the device keeps it) and which safety notes were
 * already read in full (per trial, for this browser session only).
 */
import { useCallback, useState } from 'react';
import { useMe } from '@/lib/session';
import type { TrialWithPermissions } from '@/lib/trial';

function read(storage: Storage, key: string): string | null {
  try {
    return storage.getItem(key);
  } catch {
    return null; // storage blocked (private mode): remember nothing
  }
}
function write(storage: Storage, key: string, value: string) {
  try {
    storage.setItem(key, value);
  } catch {
    /* storage blocked or full: the grower just taps the site again */
  }
}

/**
 * The site chosen on this page, else the one this account last logged at in this trial on
 * this device; and a setter that chooses and remembers it.
 */
function useRememberedSite(slug: string, accountId: string | null) {
  const key = accountId ? `rowtally.field-log.site.${accountId}.${slug}` : null;
  const [chosen, setChosen] = useState<string | null>(null);
  const remember = useCallback(
    (siteId: string) => {
      setChosen(siteId);
      if (key) write(localStorage, key, siteId);
    },
    [key],
  );
  return [chosen ?? (key ? read(localStorage, key) : null), remember] as const;
}

/** Whether a caution was already shown in full in this session for this trial. */
export function useCautionSeen(slug: string, caution: string) {
  const key = `rowtally.caution-seen.${slug}.${caution}`;
  const [seen, setSeen] = useState(() => read(sessionStorage, key) === 'yes');
  const markSeen = useCallback(() => {
    setSeen(true);
    write(sessionStorage, key, 'yes');
  }, [key]);
  return [seen, markSeen] as const;
}

/** The sites this reader logs at: a grower limited to some sees only those (the server refuses the rest). */
export const mySitesOf = (t: Pick<TrialWithPermissions, 'sites' | 'mySiteIds'>) =>
  t.mySiteIds ? t.sites.filter((s) => t.mySiteIds!.includes(s.id)) : t.sites;

/**
 * The site of this round: the one chosen now, else the one remembered for this account on
 * this device, else the only one there is. Choosing one remembers it.
 */
export function useRoundSite(slug: string, sites: { id: string }[] | undefined) {
  const me = useMe();
  const [site, choose] = useRememberedSite(slug, me.data?.id ?? null);
  const list = sites ?? [];
  const siteId =
    site && list.some((s) => s.id === site) ? site : list.length === 1 ? list[0]!.id : null;
  return [siteId, choose] as const;
}
