import {
  type Design,
  type DesignSite,
  irrigationMethods,
  siteForm,
  soilTextures,
} from '@common/contracts/design';
import { useState } from 'react';
import { CautionNote } from '@/components/ui/caution-note';
import { FormMessage, SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useDeletePart, useSavePart } from '../api/design-parts';
import { DesignPage } from '../components/design-page';
import { PartActions, PartForm, PartFormActions } from '../components/part-editing';

const irrigationLabels: Record<(typeof irrigationMethods)[number], string> = {
  drip: 'Drip',
  overhead: 'Overhead sprinkler',
  furrow: 'Furrow',
  hand: 'By hand (hose or can)',
  none: 'None (rain only)',
};

function SiteForm({
  slug,
  editing,
  onDone,
}: {
  slug: string;
  editing: DesignSite | null;
  onDone: () => void;
}) {
  const save = useSavePart(slug, 'sites', editing?.id ?? null);
  const blank = {
    name: editing?.name ?? '',
    region: editing?.region ?? '',
    soilTexture: editing?.soilTexture ?? '',
    irrigationMethod: editing?.irrigationMethod ?? '',
    notes: editing?.notes ?? '',
  };
  const form = useContractForm(siteForm, blank);
  const { errors, isSubmitting } = form.formState;
  const irrigation = form.watch('irrigationMethod');
  const onSubmit = submitTo(form, async (body) => {
    await save(body);
    form.reset(blank);
    onDone();
  });

  return (
    <PartForm
      editingId={editing?.id ?? null}
      title={editing ? `Edit ${editing.name}` : 'Add a site'}
      onSubmit={onSubmit}
    >
      <TextField label="Site name" error={errors.name?.message} {...form.register('name')} />
      <TextField
        label="Town or region"
        hint="No street address or map coordinates: sites appear on the published results sheet."
        error={errors.region?.message}
        {...form.register('region')}
      />
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField
          label="Soil texture (USDA class)"
          error={errors.soilTexture?.message}
          options={[['', 'Not recorded'], ...soilTextures.map((s) => [s, s] as const)]}
          {...form.register('soilTexture')}
        />
        <SelectField
          label="Irrigation"
          error={errors.irrigationMethod?.message}
          options={[
            ['', 'Not recorded'],
            ...irrigationMethods.map((m) => [m, irrigationLabels[m]] as const),
          ]}
          {...form.register('irrigationMethod')}
        />
      </div>
      {irrigation && irrigation !== 'none' ? <CautionNote id="irrigation-backflow" /> : null}
      <TextArea
        label="Fertility and other notes"
        error={errors.notes?.message}
        {...form.register('notes')}
      />
      <PartFormActions
        refusal={formRefusal(form)}
        pending={isSubmitting}
        submitLabel={editing ? 'Save site' : 'Add site'}
        onCancel={editing ? onDone : undefined}
      />
    </PartForm>
  );
}

function Sites({ design, slug }: { design: Design; slug: string }) {
  const [editingId, setEditingId] = useState<string | null>(null);
  const remove = useDeletePart(slug, 'sites');
  const editing = design.sites.find((s) => s.id === editingId) ?? null;
  const layoutExists = design.plots.length > 0;
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <section aria-labelledby="site-list">
        <h2 id="site-list" className="text-xl font-semibold text-leaf-900">
          {design.sites.length} {design.sites.length === 1 ? 'site' : 'sites'}
        </h2>
        {design.design !== 'multisite' ? (
          <p className="mt-1 text-sm text-loam-700">
            This design lays out one site; choose “Blocks at several sites” in the settings for
            more.
          </p>
        ) : null}
        <ul className="mt-2 space-y-2">
          {design.sites.map((s) => (
            <li key={s.id} className="rounded-lg bg-white p-3 shadow-sm">
              <p className="font-semibold">{s.name}</p>
              <p className="text-sm text-loam-700">
                {s.region || 'Region not given'} · {s.soilTexture ?? 'soil not recorded'} ·{' '}
                {s.irrigationMethod
                  ? irrigationLabels[s.irrigationMethod]
                  : 'irrigation not recorded'}
              </p>
              {s.notes ? <p className="mt-1 text-sm">{s.notes}</p> : null}
              {design.canEdit ? (
                <PartActions
                  name={s.name}
                  onEdit={() => setEditingId(s.id)}
                  layoutExists={layoutExists}
                  removing={remove.isPending}
                  confirmMessage={`Remove the site ${s.name}?`}
                  onRemove={() => remove.mutate(s.id)}
                />
              ) : null}
            </li>
          ))}
        </ul>
        {remove.error ? <FormMessage tone="error">{remove.error.message}</FormMessage> : null}
      </section>
      {design.canEdit && (editing || !layoutExists) ? (
        <SiteForm
          key={editing?.id ?? 'new'}
          slug={slug}
          editing={editing}
          onDone={() => setEditingId(null)}
        />
      ) : null}
    </div>
  );
}

export function Component() {
  return (
    <DesignPage title="Sites">{(design, slug) => <Sites design={design} slug={slug} />}</DesignPage>
  );
}
