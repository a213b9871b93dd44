import {
  editableStatuses,
  type Design,
  fertilizerPolicies,
  fertilizerPolicyLabels,
  trialSettingsForm,
} from '@common/contracts/design';
import { designLabels, trialDesigns } from '@common/contracts/trials';
import { Button } from '@/components/ui/button';
import { CautionNote } from '@/components/ui/caution-note';
import { FormMessage, SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useUpdateTrial } from '../api/update-trial';
import { CopyTrialSection } from '../components/copy-trial-section';
import { DeleteTrialSection } from '../components/delete-trial-section';
import { DesignPage } from '../components/design-page';

const statusLabels = { draft: 'Draft', active: 'Active (in the field)', closed: 'Closed' } as const;

function SettingsForm({ design, slug }: { design: Design; slug: string }) {
  const update = useUpdateTrial(slug);
  const hasPlots = design.plots.length > 0;
  const published = design.status === 'published';
  const form = useContractForm(trialSettingsForm, {
    title: design.title,
    crop: design.crop,
    season: design.season,
    design: design.design,
    ...(design.status === 'published' ? {} : { status: design.status }),
    description: design.description,
    sowingDate: design.sowingDate ?? '',
    transplantDate: design.transplantDate ?? '',
    fertilizerPolicy: design.fertilizerPolicy,
    fertilizerNotes: design.fertilizerNotes,
  });
  const { errors, isSubmitting, isSubmitSuccessful } = form.formState;
  const onSubmit = submitTo(form, (body) => update.mutateAsync(body));
  const refusal = formRefusal(form);

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      className="max-w-2xl space-y-4 rounded-xl bg-white p-4 shadow-sm"
    >
      <fieldset disabled={!design.canEdit} className="space-y-4">
        <TextField label="Title" error={errors.title?.message} {...form.register('title')} />
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Crop" error={errors.crop?.message} {...form.register('crop')} />
          <TextField label="Season" error={errors.season?.message} {...form.register('season')} />
        </div>
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField
            label="Design"
            disabled={hasPlots}
            hint={hasPlots ? 'Clear the layout to change the design.' : undefined}
            error={errors.design?.message}
            options={trialDesigns.map((d) => [d, designLabels[d]] as const)}
            {...form.register('design')}
          />
          {published ? (
            <p className="text-sm">Published: the results sheet is public.</p>
          ) : (
            <SelectField
              label="Status"
              error={errors.status?.message}
              options={editableStatuses.map((s) => [s, statusLabels[s]] as const)}
              {...form.register('status')}
            />
          )}
        </div>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label="Sowing date"
            type="date"
            error={errors.sowingDate?.message}
            {...form.register('sowingDate')}
          />
          <TextField
            label="Transplant date"
            type="date"
            error={errors.transplantDate?.message}
            {...form.register('transplantDate')}
          />
        </div>
        <TextArea
          label="Description"
          error={errors.description?.message}
          {...form.register('description')}
        />
        <SelectField
          label="Planned fertilizer use"
          hint="The plan; growers record what was applied in the field log."
          error={errors.fertilizerPolicy?.message}
          options={fertilizerPolicies.map((p) => [p, fertilizerPolicyLabels[p]] as const)}
          {...form.register('fertilizerPolicy')}
        />
        <TextArea
          label="Fertility notes (amendments before planting, compost, cover crop)"
          error={errors.fertilizerNotes?.message}
          {...form.register('fertilizerNotes')}
        />
        <CautionNote id="fertilizer-handling" />
        {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
        {isSubmitSuccessful && !refusal ? (
          <p role="status" className="text-leaf-700">
            Settings saved.
          </p>
        ) : null}
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Saving…' : 'Save settings'}
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
          {design.canEdit ? (
            <CopyTrialSection slug={slug} title={design.title} season={design.season} />
          ) : null}
          <DeleteTrialSection slug={slug} />
        </>
      )}
    </DesignPage>
  );
}
