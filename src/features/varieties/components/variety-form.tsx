/** Add a variety to a register, or edit one (group coordinators; the server checks again). */
import {
  type Variety,
  varietyForm,
  varietyTypeLabels,
  varietyTypes,
} from '@common/contracts/varieties';
import { Button } from '@/components/ui/button';
import { FormMessage, SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useSaveVariety } from '../api/save-variety';

export function VarietyForm({
  groups,
  editing,
  onSaved,
  onCancel,
}: {
  /** The groups the caller coordinates (a new variety joins one of their registers). */
  groups: { id: string; name: string }[];
  editing: Variety | null;
  onSaved: (slug: string) => void;
  onCancel?: () => void;
}) {
  const save = useSaveVariety(editing?.slug ?? null);
  const blank = {
    groupId: editing?.group.id ?? groups[0]?.id ?? '',
    name: editing?.name ?? '',
    crop: editing?.crop ?? '',
    type: editing?.type ?? 'unknown',
    origin: editing?.origin ?? '',
    seedSource: editing?.seedSource ?? '',
    description: editing?.description ?? '',
    expectedTraits: editing?.expectedTraits.join('\n') ?? '',
    aliases: editing?.aliases.join('\n') ?? '',
  };
  const form = useContractForm(varietyForm, blank);
  const { errors, isSubmitting } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    const { slug } = await save.mutateAsync(body);
    if (!editing) form.reset(blank);
    onSaved(slug);
  });
  const title = editing ? `Edit ${editing.name}` : 'Add a variety';
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={title}
      className="space-y-3 rounded-xl bg-white p-4 shadow-sm"
    >
      <h2 className="text-xl font-semibold text-leaf-900">{title}</h2>
      {!editing && groups.length > 1 ? (
        <SelectField
          label="Register"
          error={errors.groupId?.message}
          options={groups.map((g) => [g.id, g.name] as const)}
          {...form.register('groupId')}
        />
      ) : null}
      <div className="grid gap-3 sm:grid-cols-3">
        <TextField
          label="Variety name"
          className="sm:col-span-2"
          error={errors.name?.message}
          {...form.register('name')}
        />
        <TextField label="Crop" error={errors.crop?.message} {...form.register('crop')} />
      </div>
      <div className="grid gap-3 sm:grid-cols-3">
        <SelectField
          label="Type"
          error={errors.type?.message}
          options={varietyTypes.map((t) => [t, varietyTypeLabels[t]] as const)}
          {...form.register('type')}
        />
        <TextField
          label="Seed source"
          className="sm:col-span-2"
          error={errors.seedSource?.message}
          {...form.register('seedSource')}
        />
      </div>
      <TextField
        label="Origin"
        hint="Where the variety comes from: a family, a place, a breeder."
        error={errors.origin?.message}
        {...form.register('origin')}
      />
      <TextArea
        label="Description"
        error={errors.description?.message}
        {...form.register('description')}
      />
      <div className="grid gap-3 sm:grid-cols-2">
        <TextArea
          label="Expected traits"
          hint="One a line or separated by commas, e.g. dwarf habit, spineless."
          error={errors.expectedTraits?.message}
          {...form.register('expectedTraits')}
        />
        <TextArea
          label="Other names"
          hint="The same variety under another name; one a line or separated by commas."
          error={errors.aliases?.message}
          {...form.register('aliases')}
        />
      </div>
      {formRefusal(form) ? <FormMessage tone="error">{formRefusal(form)}</FormMessage> : null}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Saving…' : editing ? 'Save variety' : 'Add variety'}
        </Button>
        {onCancel ? (
          <Button type="button" variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
