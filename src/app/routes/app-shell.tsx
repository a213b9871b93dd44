import { Suspense, useEffect, useState } from 'react';
import {
  Link,
  NavLink,
  Outlet,
  useLocation,
  useNavigate,
  useNavigation,
  useParams,
} from 'react-router-dom';
import { Spinner } from '@/components/ui/spinner';
import { useTrials } from '@/features/trials/api/get-trials';
import { trialHref } from '@/features/trials/components/trial-href';
import { keepAppOnDevice } from '@/lib/offline-shell';
import { removePrerenderedSheet } from '@/lib/prerendered-sheet';
import { useMe } from '@/lib/session';
import { usePageTitle } from '../use-page-title';

function TrialSwitcher() {
  const { data } = useTrials();
  const { data: me } = useMe();
  const { slug } = useParams();
  const navigate = useNavigate();
  if (!data || data.trials.length === 0) return null;
  return (
    <label className="flex items-center gap-2 text-sm">
      <span className="sr-only sm:not-sr-only">Trial</span>
      <select
        className="min-h-11 max-w-[12rem] rounded-lg border border-leaf-300 bg-white px-2 text-ink sm:max-w-xs"
        value={slug ?? ''}
        onChange={(e) => {
          const trial = data.trials.find((t) => t.slug === e.target.value);
          if (trial) navigate(trialHref(trial, me?.isAdmin ?? false));
        }}
      >
        <option value="">Choose a trial…</option>
        {data.trials.map((t) => (
          <option key={t.id} value={t.slug}>
            {t.title}
          </option>
        ))}
      </select>
    </label>
  );
}

function UserMenu() {
  const { data: me, isPending } = useMe();
  if (isPending) return <span className="text-sm text-leaf-100">…</span>;
  if (!me) {
    return (
      <Link
        to="/sign-in"
        className="inline-flex min-h-11 items-center rounded-lg bg-pod-500 px-3 font-semibold text-ink"
      >
        Sign in
      </Link>
    );
  }
  return (
    <details className="relative">
      <summary className="flex min-h-11 cursor-pointer list-none items-center gap-2 rounded-lg px-2 text-white hover:bg-leaf-900">
        <span
          aria-hidden
          className="grid h-8 w-8 place-items-center rounded-full bg-pod-500 font-bold text-ink"
        >
          {me.name.slice(0, 1).toUpperCase()}
        </span>
        {/* On a phone only the initial shows: the words stay for screen readers. */}
        <span className="sr-only">Account menu: </span>
        <span className="sr-only sm:not-sr-only">{me.name}</span>
      </summary>
      <div className="absolute right-0 z-20 mt-1 w-56 rounded-lg border border-leaf-100 bg-white p-2 text-ink shadow-lg">
        <p className="truncate px-2 py-1 text-sm text-loam-700">{me.email}</p>
        <Link to="/account" className="block rounded px-2 py-2 hover:bg-leaf-50">
          Account and units
        </Link>
        <Link to="/sign-out" className="block rounded px-2 py-2 hover:bg-leaf-50">
          Sign out
        </Link>
      </div>
    </details>
  );
}

/** Analysis of one's own spreadsheet and new trials are for signed-in users. */
function SignedInLinks() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <NavLink to="/varieties" end className={navClass}>
        Varieties
      </NavLink>
      <NavLink to="/analyze" className={navClass}>
        Analyze a spreadsheet
      </NavLink>
      <NavLink to="/trials/new" className={navClass}>
        New trial
      </NavLink>
    </>
  );
}

/** Shown to the trial's leads (and administrators); the server checks again on every call. */
function MembersLink() {
  const { slug } = useParams();
  const { data: me } = useMe();
  const { data } = useTrials();
  const role = data?.trials.find((t) => t.slug === slug)?.myRole;
  if (!slug || !me || !(role === 'lead' || me.isAdmin)) return null;
  return (
    <NavLink to={`/t/${slug}/members`} className={navClass}>
      Members
    </NavLink>
  );
}

const navClass = ({ isActive }: { isActive: boolean }) =>
  `inline-flex min-h-11 items-center rounded-lg px-3 font-medium ${isActive ? 'bg-leaf-100 text-leaf-900' : 'text-leaf-700 hover:bg-leaf-50'}`;

export function AppShell() {
  const navigation = useNavigation();
  usePageTitle();
  const { data: me } = useMe();
  useEffect(() => {
    if (me) keepAppOnDevice();
  }, [me]);
  // A results sheet drawn by the server belongs to the first page only.
  const { pathname } = useLocation();
  const [firstPath] = useState(pathname);
  useEffect(() => {
    if (pathname !== firstPath) removePrerenderedSheet();
  }, [pathname, firstPath]);
  return (
    <div className="min-h-screen">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:bg-white focus:p-2"
      >
        Skip to content
      </a>
      <header className="no-print bg-leaf-700 text-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-2 px-3 py-2 sm:px-6">
          <Link
            to="/"
            className="flex items-center gap-2 font-display text-2xl font-semibold tracking-tight"
          >
            <img src="/favicon.svg" alt="" className="h-8 w-8" />
            Rowtally
          </Link>
          <div className="flex items-center gap-2">
            <TrialSwitcher />
            <UserMenu />
          </div>
        </div>
      </header>
      <nav aria-label="Main" className="no-print border-b border-leaf-100 bg-white">
        <div className="mx-auto flex max-w-6xl gap-1 overflow-x-auto px-3 py-1 sm:px-6">
          <NavLink to="/" end className={navClass}>
            Trials
          </NavLink>
          <NavLink to="/r" end className={navClass}>
            Published sheets
          </NavLink>
          <SignedInLinks />
          <MembersLink />
        </div>
      </nav>
      {navigation.state === 'loading' ? (
        <div
          className="h-1 animate-pulse bg-pod-500"
          role="progressbar"
          aria-label="Loading page"
        />
      ) : null}
      <main id="main" className="mx-auto max-w-6xl px-3 py-4 sm:px-6 sm:py-6">
        <Suspense fallback={<Spinner />}>
          <Outlet />
        </Suspense>
      </main>
    </div>
  );
}
