/**
 * The published results sheet rendered to HTML on the server, once per published version, so a
 * reader sees the ranked sheet before any script has loaded. The client then mounts the same
 * `SheetToolbar` and `SheetView` in its place with the same numbers (embedded beside it), so
 * nothing moves or changes; only Print starts to work.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { renderToString } from 'react-dom/server';
import type { ResultSnapshot } from '@common/contracts/results';
import type { TrialOffer } from '@common/contracts/seed';
import { SheetToolbar } from '@/features/results/components/sheet-toolbar';
import { SheetView } from '@/features/results/components/sheet-view';

export function renderSheetHtml(sheet: ResultSnapshot, offers: readonly TrialOffer[] = []): string {
  // No session on the server: the sheet is drawn in the default (metric) units, as for anyone
  // signed out; a signed-in reader's own units take over when the client mounts.
  const queryClient = new QueryClient({ defaultOptions: { queries: { enabled: false } } });
  return renderToString(
    <QueryClientProvider client={queryClient}>
      <SheetToolbar sheet={sheet} printable={false} />
      <SheetView sheet={sheet} offers={offers} />
    </QueryClientProvider>,
  );
}
