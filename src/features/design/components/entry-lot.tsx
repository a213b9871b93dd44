import { type EntryLots, setEntryLotBody } from '@common/contracts/seed';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { FormMessage, SelectField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useSetEntryLot } from '../api/entry-lots';

type Entry = EntryLots['entries'][number];

/** Which of its variety's seed lots an entry was sown from (set by the trial's lead). */
export function EntryLot({
  slug,
  entry,
  canEdit,
}: {
  slug: string;
  entry: Entry;
  canEdit: boolean;
}) {
  const save = useSetEntryLot(slug);
  const form = useContractForm(setEntryLotBody, { lotId: entry.lotId ?? '' });
  const { errors, isSubmitting, isSubmitSuccessful, isDirty } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    await save(entry.entryId, body);
    form.reset({ lotId: body.lotId ?? '' });
  });
  const current = entry.lots.find((l) => l.id === entry.lotId);
  const seedLink = entry.variety ? (
    <Link className="text-sm text-leaf-700 underline" to={`/varieties/${entry.variety.slug}/seed`}>
      Seed lots of {entry.variety.name}
    </Link>
  ) : null;
  if (!canEdit || entry.lots.length === 0)
    return (
      <p className="mt-1 text-sm">
        {current ? `Sown from lot ${current.label} · ` : ''}
        {seedLink}
      </p>
    );
  return (
    <form onSubmit={onSubmit} noValidate className="mt-2 flex flex-wrap items-end gap-2">
      <SelectField
        label={`Seed lot of ${entry.entryName}`}
        className="min-w-48"
        options={[
          ['', 'Not recorded'],
          ...entry.lots.map(
            (l) => [l.id, l.harvestYear ? `${l.label} (${l.harvestYear})` : l.label] as const,
          ),
        ]}
        error={errors.lotId?.message}
        {...form.register('lotId')}
      />
      <Button type="submit" variant="secondary" disabled={isSubmitting || !isDirty}>
        Save the lot
      </Button>
      {isSubmitSuccessful && !isDirty ? (
        <span role="status" className="text-sm text-leaf-700">
          Saved.
        </span>
      ) : null}
      {formRefusal(form) ? <FormMessage tone="error">{formRefusal(form)}</FormMessage> : null}
      {seedLink}
    </form>
  );
}
