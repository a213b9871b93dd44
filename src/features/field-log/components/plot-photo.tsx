import { plotPhotoForm } from '@common/contracts/photos';
import type { RecordPlot } from '@common/contracts/records';
import { useEffect, useId } from 'react';
import { localToday } from '@common/calendar-date';
import { TextField } from '@/components/ui/text-field';
import { clientId } from '@/lib/client-id';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import type { NewOutboxItem } from '../api/outbox';

/**
 * "Add photo" for the plot in hand: the phone's back camera (or a file on a computer). The
 * photo is kept in the outbox with the records and sent, with progress, when there is signal.
 * The caption is checked by the upload's contract when the photo is chosen.
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
  const form = useContractForm(plotPhotoForm, { caption: suggested });
  const { errors } = form.formState;
  // The suggestion follows the round's date until the grower writes their own caption.
  useEffect(() => {
    if (!form.getFieldState('caption').isDirty)
      form.resetField('caption', { defaultValue: suggested });
  }, [form, suggested]);

  const queue = (file: File) =>
    submitTo(form, async ({ caption }) => {
      await onQueue([
        {
          id: clientId(),
          trialSlug: slug,
          kind: 'photo',
          method: 'POST',
          url: `/api/trials/${encodeURIComponent(slug)}/photos`,
          body: { caption, plotId: plot.plotId, takenOn: date, today: localToday() },
          file,
          fileName: file.name || 'photo.jpg',
          label: `Plot ${plot.plotNumber} (${plot.entryCode}) · photo: ${caption.slice(0, 60)}`,
        },
      ]);
      form.reset({ caption: suggested });
    })();

  return (
    <div className="mt-3 space-y-2 border-t border-leaf-100 pt-3">
      <TextField
        label="Photo caption"
        hint="Read aloud to anyone who cannot see the photo."
        error={errors.caption?.message ?? formRefusal(form)}
        maxLength={300}
        {...form.register('caption')}
      />
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
            if (file) await queue(file);
          }}
        />
      </label>
    </div>
  );
}
