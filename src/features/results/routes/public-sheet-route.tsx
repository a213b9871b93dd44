import { utcDateOf } from '@common/calendar-date';
import { lazy, Suspense, useLayoutEffect, useRef } from 'react';
import { Link, useParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import {
  hasPrerenderedSheet,
  keepPrerenderedSheetIn,
  removePrerenderedSheet,
} from '@/lib/prerendered-sheet';
import { usePublishedSheet } from '../api/get-published-sheet';
import { useTrialOffers } from '../api/get-trial-offers';
import { useVersions } from '../api/get-versions';
import { SheetToolbar } from '../components/sheet-toolbar';
import type { ResultSnapshot } from '@common/contracts/results';
import type { TrialOffer } from '@common/contracts/seed';

// The follow form (react-hook-form and its resolver) is not needed to read the sheet, so it is
// loaded after the sheet shows.
const FollowForm = lazy(() =>
  import('../components/follow-form').then((m) => ({ default: m.FollowForm })),
);

// The sheet's own drawing (its tables on the table library) is asked for as soon as this page
// loads, beside the numbers, but is not part of the first download: until it arrives the server's
// drawing of the same sheet stays on screen, so a reader on a weak signal reads it at once.
const sheetView = import('../components/sheet-view');
const SheetView = lazy(() => sheetView.then((m) => ({ default: m.SheetView })));

/** The sheet drawn by the client; the server's drawing goes only once this one is on the page. */
function SheetOverDrawing(props: { sheet: ResultSnapshot; offers?: readonly TrialOffer[] }) {
  useLayoutEffect(() => removePrerenderedSheet(), []);
  return <SheetView {...props} />;
}

/**
 * While the client's drawing loads: the server's, moved to where the client's will go (before the
 * first paint of the app around it), and taken away with this holder when the client's mounts.
 */
function DrawingMeanwhile() {
  const holder = useRef<HTMLDivElement>(null);
  useLayoutEffect(() => {
    if (holder.current) keepPrerenderedSheetIn(holder.current);
  }, []);
  return <div ref={holder} />;
}

export function Component() {
  const { slug = '', version } = useParams();
  const number = version ? Number(version) : undefined;
  const { data: sheet, isPending, error } = usePublishedSheet(slug, number);
  const { data: versions } = useVersions(slug);
  const { data: offers } = useTrialOffers(slug);
  // The server's drawing of the sheet goes once this page shows the sheet (or why it cannot).
  useLayoutEffect(() => {
    if (error) removePrerenderedSheet();
  }, [error]);
  useLayoutEffect(() => removePrerenderedSheet, []);

  if (isPending) return <Spinner label="Loading the results…" />;
  if (error) return <ErrorPanel error={error} title="These results are not available" />;
  return (
    // Nothing of the page shows above the server's drawing while the client's loads.
    <Suspense
      fallback={
        hasPrerenderedSheet() ? <DrawingMeanwhile /> : <Spinner label="Loading the results…" />
      }
    >
      <div>
        <SheetToolbar sheet={sheet} printable />
        <SheetOverDrawing sheet={sheet} offers={offers?.offers} />
        {versions && versions.versions.length > 1 ? (
          <nav aria-label="Versions" className="no-print mx-auto mt-6 max-w-4xl">
            <h2 className="text-lg font-semibold text-leaf-900">Versions</h2>
            <ul className="mt-2 space-y-1 text-sm">
              {versions.versions.map((v) => (
                <li key={v.version}>
                  {v.version === sheet.version ? (
                    <strong>Version {v.version}</strong>
                  ) : (
                    <Link className="text-leaf-700 underline" to={`/r/${slug}/v/${v.version}`}>
                      Version {v.version}
                    </Link>
                  )}{' '}
                  — {utcDateOf(v.publishedAt)}
                  {v.changeNote ? `: ${v.changeNote}` : ''}
                </li>
              ))}
            </ul>
          </nav>
        ) : null}
        <section
          className="no-print mx-auto mt-6 max-w-4xl rounded-lg bg-white p-4 shadow-sm"
          aria-label="Follow these results"
        >
          <Suspense fallback={<p className="min-h-[4.75rem] text-sm">Loading the follow form…</p>}>
            <FollowForm slug={slug} />
          </Suspense>
          <p className="mt-2 text-xs text-loam-700">
            We send a confirmation first; every message has a one-click unsubscribe link.
          </p>
        </section>
      </div>
    </Suspense>
  );
}
