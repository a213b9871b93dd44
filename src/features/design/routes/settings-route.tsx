import {
  editableStatuses,
  type Design,
  fertilizerPolicies,
  fertilizerPolicyLabels,
  type UpdateTrialBody,
} from '@common/contracts/design';
import { designLabels, trialDesigns } from '@common/contracts/trials';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { CautionNote } from '@/components/ui/caution-note';
import { useUpdateTrial } from '../api/update-trial';
import { DeleteTrialSection } from '../components/delete-trial-section';
import { DesignPage } from '../components/design-page';
import {
  fieldErrors,
  FormError,
  SelectField,
  TextArea,
  TextField,
} from '../components/form-fields';

const statusLabels = { draft: 'Draft', active: 'Active (in the field)', closed: 'Closed' } as const;

function SettingsForm({ design, slug }: { design: Design; slug: string }) {
  const update = useUpdateTrial(slug);
  const [saved, setSaved] = useState(false);
  const errors = fieldErrors(update.error);
  const hasPlots = design.plots.length > 0;

  function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const body: UpdateTrialBody = {
      title: String(f.get('title')),
      crop: String(f.get('crop')),
      season: String(f.get('season')),
      design: String(f.get('design')) as Design['design'],
      description: String(f.get('description') ?? ''),
      sowingDate: String(f.get('sowingDate') ?? '') || null,
      transplantDate: String(f.get('transplantDate') ?? '') || null,
      fertilizerPolicy: String(f.get('fertilizerPolicy')) as Design['fertilizerPolicy'],
      fertilizerNotes: String(f.get('fertilizerNotes') ?? ''),
    };
    if (design.status !== 'published')
      body.status = String(f.get('status')) as (typeof editableStatuses)[number];
    setSaved(false);
    update.mutate(body, { onSuccess: () => setSaved(true) });
  }

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      className="max-w-2xl space-y-4 rounded-xl bg-white p-4 shadow-sm"
    >
      <fieldset disabled={!design.canEdit} className="space-y-4">
        <TextField label="Title" name="title" defaultValue={design.title} error={errors.title} />
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Crop" name="crop" defaultValue={design.crop} error={errors.crop} />
          <TextField
            label="Season"
            name="season"
            defaultValue={design.season}
            error={errors.season}
          />
        </div>
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField
            label="Design"
            name="design"
            defaultValue={design.design}
            disabled={hasPlots}
            hint={hasPlots ? 'Clear the layout to change the design.' : undefined}
            error={errors.design}
            options={trialDesigns.map((d) => [d, designLabels[d]] as const)}
          />
          {design.status === 'published' ? (
            <p className="text-sm">Published: the results sheet is public.</p>
          ) : (
            <SelectField
              label="Status"
              name="status"
              defaultValue={design.status}
              error={errors.status}
              options={editableStatuses.map((s) => [s, statusLabels[s]] as const)}
            />
          )}
        </div>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label="Sowing date"
            name="sowingDate"
            type="date"
            defaultValue={design.sowingDate ?? ''}
            error={errors.sowingDate}
          />
          <TextField
            label="Transplant date"
            name="transplantDate"
            type="date"
            defaultValue={design.transplantDate ?? ''}
            error={errors.transplantDate}
          />
        </div>
        <TextArea
          label="Description"
          name="description"
          defaultValue={design.description}
          error={errors.description}
        />
        <SelectField
          label="Planned fertilizer use"
          name="fertilizerPolicy"
          defaultValue={design.fertilizerPolicy}
          hint="The plan; growers record what was applied in the field log."
          error={errors.fertilizerPolicy}
          options={fertilizerPolicies.map((p) => [p, fertilizerPolicyLabels[p]] as const)}
        />
        <TextArea
          label="Fertility notes (amendments before planting, compost, cover crop)"
          name="fertilizerNotes"
          defaultValue={design.fertilizerNotes}
          error={errors.fertilizerNotes}
        />
        <CautionNote id="fertilizer-handling" />
        <FormError error={update.error} />
        {saved ? (
          <p role="status" className="text-leaf-700">
            Settings saved.
          </p>
        ) : null}
        <Button type="submit" disabled={update.isPending}>
          {update.isPending ? 'Saving…' : 'Save settings'}
        </Button>
      </fieldset>
    </form>
  );
}

export function Component() {
  return (
    <DesignPage title="Trial settings">
      {(design, slug) => (
        <>
          <SettingsForm key={design.id} design={design} slug={slug} />
          <DeleteTrialSection slug={slug} />
        </>
      )}
    </DesignPage>
  );
}
