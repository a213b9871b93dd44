import {
  photoSubjectLabels,
  photoSubjects,
  type PhotoTagging,
  type PhotoTagText,
} from '@common/contracts/photos';
import { get, type UseFormReturn } from 'react-hook-form';
import { SelectField, TextField } from '@/components/ui/text-field';

export const emptyTags: PhotoTagText = {
  caption: '',
  entryId: '',
  plotId: '',
  takenOn: '',
  subject: '',
};

/**
 * Caption, entry, plot, date and subject, with labels, on a form built on `photoTagForm`: the
 * form itself (`name` left out) or one photo's tags inside a batch form (`name` its path). The
 * plot list follows the entry.
 */
export function PhotoTagFields({
  form,
  name,
  tagging,
  dateHint = 'Leave empty to use the date the photo was taken.',
  disabled,
}: {
  form: UseFormReturn<any, any, any>;
  name?: string;
  tagging: PhotoTagging;
  dateHint?: string;
  disabled?: boolean;
}) {
  const path = (field: keyof PhotoTagText) => (name ? `${name}.${field}` : field);
  const error = (field: keyof PhotoTagText): string | undefined =>
    (get(form.formState.errors, path(field)) as { message?: string } | undefined)?.message;
  const entryId: string = form.watch(path('entryId')) ?? '';
  const plotId: string = form.watch(path('plotId')) ?? '';
  const plots = tagging.plots.filter((p) => !entryId || p.entryId === entryId);
  return (
    <div className="grid gap-2 text-sm sm:grid-cols-2">
      <TextField
        className="sm:col-span-2"
        label={
          <>
            Caption <span className="text-frost-600">(required)</span>
          </>
        }
        hint="What the photo shows, for people who cannot see it."
        maxLength={300}
        disabled={disabled}
        error={error('caption')}
        {...form.register(path('caption'))}
      />
      <SelectField
        label="Entry"
        disabled={disabled}
        error={error('entryId')}
        options={[
          ['', 'No entry'],
          ...tagging.entries.map((e) => [e.id, `${e.code} · ${e.name}`] as const),
        ]}
        {...form.register(path('entryId'), {
          onChange: (e: React.ChangeEvent<HTMLSelectElement>) => {
            const stillFits = tagging.plots.some(
              (p) => p.id === plotId && p.entryId === e.target.value,
            );
            if (!stillFits) form.setValue(path('plotId'), '');
          },
        })}
      />
      <SelectField
        label="Plot"
        disabled={disabled}
        error={error('plotId')}
        options={[
          ['', 'No plot'],
          ...plots.map(
            (p) => [p.id, `${p.siteName} · plot ${p.plotNumber} (block ${p.block})`] as const,
          ),
        ]}
        {...form.register(path('plotId'), {
          onChange: (e: React.ChangeEvent<HTMLSelectElement>) => {
            const plot = tagging.plots.find((p) => p.id === e.target.value);
            if (plot) form.setValue(path('entryId'), plot.entryId);
          },
        })}
      />
      <TextField
        label="Date taken"
        type="date"
        hint={dateHint}
        disabled={disabled}
        error={error('takenOn')}
        {...form.register(path('takenOn'))}
      />
      <SelectField
        label="Subject"
        disabled={disabled}
        error={error('subject')}
        options={[
          ['', 'Not said'],
          ...photoSubjects.map((s) => [s, photoSubjectLabels[s]] as const),
        ]}
        {...form.register(path('subject'))}
      />
    </div>
  );
}
