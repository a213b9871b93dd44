import type { RecordPlot } from '@common/contracts/records';
import { useId, useState } from 'react';
import { localToday } from '@common/calendar-date';
import { clientId } from '@/lib/client-id';
import type { NewOutboxItem } from '../api/outbox';

/**
 * "Add photo" for the plot in hand: the phone's back camera (or a file on a computer). The
 * photo is kept in the outbox with the records and sent, with progress, when there is signal.
 */
export function PlotPhoto({
  slug,
  plot,
  date,
  onQueue,
}: {
  slug: string;
  plot: RecordPlot;
  date: string;
  onQueue: (items: NewOutboxItem[]) => Promise<void>;
}) {
  const id = useId();
  const suggested = `Plot ${plot.plotNumber}, ${plot.entryName} (${plot.entryCode}), ${date}`;
  const [caption, setCaption] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const text = (caption ?? suggested).trim();

  return (
    <div className="mt-3 space-y-2 border-t border-leaf-100 pt-3">
      <div className="flex flex-col gap-1">
        <label htmlFor={`${id}-caption`} className="font-medium">
          Photo caption
        </label>
        <input
          id={`${id}-caption`}
          value={caption ?? suggested}
          maxLength={300}
          onChange={(e) => setCaption(e.target.value)}
          aria-describedby={`${id}-hint`}
          className="min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-3"
        />
        <p id={`${id}-hint`} className="text-sm text-loam-700">
          Read aloud to anyone who cannot see the photo.
        </p>
      </div>
      <label
        htmlFor={`${id}-file`}
        className="inline-flex min-h-11 cursor-pointer items-center rounded-lg border border-leaf-700 px-3 font-semibold text-leaf-700 has-[:focus-visible]:ring-2 has-[:focus-visible]:ring-pod-500"
      >
        Add photo
        <input
          id={`${id}-file`}
          type="file"
          accept="image/*"
          capture="environment"
          className="sr-only"
          onChange={async (e) => {
            const file = e.target.files?.[0];
            e.target.value = '';
            if (!file) return;
            if (!text) return setProblem('Write a caption first.');
            setProblem(null);
            const photoId = clientId();
            await onQueue([
              {
                id: photoId,
                trialSlug: slug,
                kind: 'photo',
                method: 'POST',
                url: `/api/trials/${encodeURIComponent(slug)}/photos`,
                body: { caption: text, plotId: plot.plotId, takenOn: date, today: localToday() },
                file,
                fileName: file.name || 'photo.jpg',
                label: `Plot ${plot.plotNumber} (${plot.entryCode}) · photo: ${text.slice(0, 60)}`,
              },
            ]);
            setCaption(null);
          }}
        />
      </label>
      {problem ? (
        <p role="alert" className="text-sm font-medium text-frost-600">
          {problem}
        </p>
      ) : null}
    </div>
  );
}
