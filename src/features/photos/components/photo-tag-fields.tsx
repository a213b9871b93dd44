import {
  type PhotoSubject,
  photoSubjectLabels,
  photoSubjects,
  type PhotoTagging,
} from '@common/contracts/photos';

export interface PhotoTags {
  caption: string;
  entryId: string;
  plotId: string;
  takenOn: string;
  subject: PhotoSubject | '';
}

export const emptyTags: PhotoTags = {
  caption: '',
  entryId: '',
  plotId: '',
  takenOn: '',
  subject: '',
};

const field = 'min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-2 text-ink';

/** Caption, entry, plot, date and subject, with labels; the plot list follows the entry. */
export function PhotoTagFields({
  idPrefix,
  tags,
  onChange,
  tagging,
  errors = {},
  dateHint = 'Leave empty to use the date the photo was taken.',
  disabled,
}: {
  idPrefix: string;
  tags: PhotoTags;
  onChange: (tags: PhotoTags) => void;
  tagging: PhotoTagging;
  errors?: Partial<Record<keyof PhotoTags, string>>;
  dateHint?: string;
  disabled?: boolean;
}) {
  const plots = tagging.plots.filter((p) => !tags.entryId || p.entryId === tags.entryId);
  const id = (k: string) => `${idPrefix}-${k}`;
  const set = (patch: Partial<PhotoTags>) => onChange({ ...tags, ...patch });
  return (
    <div className="grid gap-2 sm:grid-cols-2">
      <div className="sm:col-span-2">
        <label htmlFor={id('caption')} className="block text-sm font-medium">
          Caption <span className="text-frost-600">(required)</span>
        </label>
        <input
          id={id('caption')}
          className={field}
          value={tags.caption}
          maxLength={300}
          required
          disabled={disabled}
          aria-invalid={errors.caption ? true : undefined}
          aria-describedby={errors.caption ? id('caption-error') : id('caption-hint')}
          onChange={(e) => set({ caption: e.target.value })}
        />
        {errors.caption ? (
          <p id={id('caption-error')} className="text-sm text-frost-600">
            {errors.caption}
          </p>
        ) : (
          <p id={id('caption-hint')} className="text-xs text-loam-700">
            What the photo shows, for people who cannot see it.
          </p>
        )}
      </div>
      <div>
        <label htmlFor={id('entry')} className="block text-sm font-medium">
          Entry
        </label>
        <select
          id={id('entry')}
          className={field}
          value={tags.entryId}
          disabled={disabled}
          onChange={(e) => {
            const entryId = e.target.value;
            const plotStillFits = tagging.plots.some(
              (p) => p.id === tags.plotId && p.entryId === entryId,
            );
            set({ entryId, plotId: plotStillFits ? tags.plotId : '' });
          }}
        >
          <option value="">No entry</option>
          {tagging.entries.map((e) => (
            <option key={e.id} value={e.id}>
              {e.code} · {e.name}
            </option>
          ))}
        </select>
        {errors.entryId ? <p className="text-sm text-frost-600">{errors.entryId}</p> : null}
      </div>
      <div>
        <label htmlFor={id('plot')} className="block text-sm font-medium">
          Plot
        </label>
        <select
          id={id('plot')}
          className={field}
          value={tags.plotId}
          disabled={disabled}
          onChange={(e) => {
            const plot = tagging.plots.find((p) => p.id === e.target.value);
            set({ plotId: e.target.value, entryId: plot ? plot.entryId : tags.entryId });
          }}
        >
          <option value="">No plot</option>
          {plots.map((p) => (
            <option key={p.id} value={p.id}>
              {p.siteName} · plot {p.plotNumber} (block {p.block})
            </option>
          ))}
        </select>
        {errors.plotId ? <p className="text-sm text-frost-600">{errors.plotId}</p> : null}
      </div>
      <div>
        <label htmlFor={id('date')} className="block text-sm font-medium">
          Date taken
        </label>
        <input
          id={id('date')}
          type="date"
          className={field}
          value={tags.takenOn}
          disabled={disabled}
          aria-describedby={id('date-hint')}
          onChange={(e) => set({ takenOn: e.target.value })}
        />
        <p id={id('date-hint')} className="text-xs text-loam-700">
          {dateHint}
        </p>
      </div>
      <div>
        <label htmlFor={id('subject')} className="block text-sm font-medium">
          Subject
        </label>
        <select
          id={id('subject')}
          className={field}
          value={tags.subject}
          disabled={disabled}
          onChange={(e) => set({ subject: e.target.value as PhotoSubject | '' })}
        >
          <option value="">Not said</option>
          {photoSubjects.map((s) => (
            <option key={s} value={s}>
              {photoSubjectLabels[s]}
            </option>
          ))}
        </select>
      </div>
    </div>
  );
}
