import { licenseLabels, licenses, publishBody, saveSheetForm } from '@common/contracts/results';
import {
  basisLabels,
  analysisBases,
  defaultModelFor,
  modelLabels,
  modelsForDesign,
} from '@common/contracts/analysis';
import type { SheetDraft } from '@common/contracts/results';
import type { TrialDetail } from '@common/contracts/trials';
import { useEffect, useRef, useState } from 'react';
import { useFieldArray } from 'react-hook-form';
import { Link, useParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { FormMessage, SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useTrial } from '@/lib/trial';
import { useTrialPhotos } from '../api/get-entry-photos';
import {
  usePublishSheet,
  useSaveSheet,
  useSheetDraft,
  useSheetPreview,
  useUnpublishSheet,
} from '../api/sheet-draft';
import { SheetView } from '../components/sheet-view';

export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const draft = useSheetDraft(slug);
  if (draft.error) return <ErrorPanel error={draft.error} />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  if (trial.isPending || draft.isPending) return <Spinner label="Loading the results sheet…" />;
  return <SheetEditor slug={slug} trial={trial.data} draft={draft.data} />;
}

/** The form starts from the draft as it was when the page opened. */
const formValuesOf = (d: SheetDraft, entryIds: string[]) => ({
  summary: d.summary,
  ownMethods: d.methods !== null,
  methods: d.methods ?? d.generatedMethods,
  traits: d.traits.map((t) => ({ ...t, weight: String(t.weight) })),
  entryNotes: Object.fromEntries(entryIds.map((id) => [id, d.entryNotes[id] ?? ''])),
  coverPhotos: Object.fromEntries(entryIds.map((id) => [id, d.coverPhotos[id] ?? ''])),
  alpha: String(d.alpha),
  letters: d.letters,
  model: d.model ?? '',
  license: d.license,
});

function SheetEditor({
  slug,
  trial: t,
  draft: d,
}: {
  slug: string;
  trial: TrialDetail;
  draft: SheetDraft;
}) {
  const photos = useTrialPhotos(slug);
  const save = useSaveSheet(slug);
  const form = useContractForm(
    saveSheetForm,
    formValuesOf(
      d,
      t.entries.map((e) => e.id),
    ),
  );
  const traits = useFieldArray({ control: form.control, name: 'traits' });
  const { errors, isSubmitting, isSubmitSuccessful } = form.formState;
  const onSave = submitTo(form, (body) => save.mutateAsync(body));
  const refusal = formRefusal(form);
  const [showPreview, setShowPreview] = useState(false);
  // Counts the clicks on Preview: each one brings the preview into view, below a long form.
  const [previewAsked, setPreviewAsked] = useState(0);
  const previewRef = useRef<HTMLElement>(null);
  const preview = useSheetPreview(slug, showPreview);
  useEffect(() => {
    if (previewAsked === 0) return;
    const section = previewRef.current;
    section?.scrollIntoView?.({ behavior: 'smooth', block: 'start' });
    section?.focus({ preventScroll: true });
  }, [previewAsked]);

  const chosen = new Map(traits.fields.map((x, i) => [x.key, i]));
  const ownMethods = form.watch('ownMethods');
  const photoList = photos.data?.photos ?? [];

  return (
    <div>
      <p className="text-sm text-loam-700">
        <Link to={`/t/${slug}`} className="underline">
          {t.title}
        </Link>
      </p>
      <h1 className="text-3xl font-semibold text-leaf-900">Results sheet</h1>
      <p className="mt-1">
        {d.publishedVersion ? (
          <>
            Version {d.publishedVersion} is {d.isPublic ? 'public at ' : 'unpublished (hidden) — '}
            {d.isPublic ? (
              <Link to={`/r/${slug}`} className="font-semibold text-leaf-700 underline">
                /r/{slug}
              </Link>
            ) : (
              'publish again to show it'
            )}
            .
          </>
        ) : (
          'Not published yet.'
        )}
      </p>

      <form
        className="mt-4 space-y-6"
        noValidate
        aria-label="Results sheet draft"
        onSubmit={onSave}
      >
        <fieldset className="rounded-lg bg-white p-4 shadow-sm">
          <legend className="px-1 font-semibold text-leaf-900">
            Traits, order and ranking weights
          </legend>
          <ul className="space-y-2">
            {t.traits.map((trait) => {
              const i = chosen.get(trait.key);
              const on = i !== undefined;
              return (
                <li
                  key={trait.key}
                  className="flex flex-wrap items-end gap-2 border-b border-leaf-50 pb-2"
                >
                  <label className="flex min-h-11 flex-1 items-center gap-2">
                    <input
                      type="checkbox"
                      className="h-5 w-5"
                      checked={on}
                      onChange={(e) =>
                        e.target.checked
                          ? traits.append({ key: trait.key, basis: 'plot', weight: '1' })
                          : i !== undefined && traits.remove(i)
                      }
                    />
                    {trait.label}
                  </label>
                  {on ? (
                    <>
                      <SelectField
                        className="text-sm"
                        label="Basis"
                        options={analysisBases.map((b) => [b, basisLabels[b]] as const)}
                        error={errors.traits?.[i]?.basis?.message}
                        {...form.register(`traits.${i}.basis`)}
                      />
                      <TextField
                        className="w-24 text-sm"
                        label="Weight"
                        inputMode="decimal"
                        error={errors.traits?.[i]?.weight?.message}
                        {...form.register(`traits.${i}.weight`)}
                      />
                      <Button
                        type="button"
                        variant="ghost"
                        aria-label={`Move ${trait.label} up`}
                        disabled={i === 0}
                        onClick={() => traits.swap(i, i - 1)}
                      >
                        ↑
                      </Button>
                      <Button
                        type="button"
                        variant="ghost"
                        aria-label={`Move ${trait.label} down`}
                        disabled={i === traits.fields.length - 1}
                        onClick={() => traits.swap(i, i + 1)}
                      >
                        ↓
                      </Button>
                    </>
                  ) : null}
                </li>
              );
            })}
          </ul>
          {(errors.traits?.root?.message ?? errors.traits?.message) ? (
            <p role="alert" className="mt-2 text-sm font-medium text-frost-600">
              {errors.traits?.root?.message ?? errors.traits?.message}
            </p>
          ) : null}
          <div className="mt-3 grid gap-3 text-sm sm:grid-cols-3">
            <TextField
              label="Significance level (α)"
              inputMode="decimal"
              error={errors.alpha?.message}
              {...form.register('alpha')}
            />
            <SelectField
              label="Letters from"
              options={[
                ['hsd', "Tukey's HSD"],
                ['lsd', "Fisher's LSD"],
              ]}
              {...form.register('letters')}
            />
            <SelectField
              label="Model"
              options={[
                [
                  '',
                  t.factor?.arrangement === 'split_plot'
                    ? 'As the data suggest (classical strata; the mixed model once plots are lost)'
                    : `As the design suggests (${modelLabels[defaultModelFor(t.design, Boolean(t.factor))]})`,
                ],
                ...modelsForDesign(
                  t.design,
                  Boolean(t.factor),
                  t.factor?.arrangement === 'split_plot',
                ).map((m) => [m, modelLabels[m]] as const),
              ]}
              error={errors.model?.message}
              {...form.register('model')}
            />
            <SelectField
              label="Licence of the published numbers"
              options={licenses.map((l) => [l, licenseLabels[l]] as const)}
              {...form.register('license')}
            />
          </div>
        </fieldset>

        <div className="rounded-lg bg-white p-4 shadow-sm">
          <TextArea
            label="Summary"
            rows={6}
            error={errors.summary?.message}
            {...form.register('summary')}
          />
        </div>

        <fieldset className="rounded-lg bg-white p-4 shadow-sm">
          <legend className="px-1 font-semibold text-leaf-900">Methods</legend>
          <label className="flex min-h-11 items-center gap-2">
            <input type="checkbox" className="h-5 w-5" {...form.register('ownMethods')} />
            Write my own methods paragraph
          </label>
          {ownMethods ? (
            <TextArea
              label="Methods"
              rows={8}
              error={errors.methods?.message}
              {...form.register('methods')}
            />
          ) : (
            <p className="mt-2 whitespace-pre-line text-sm">{d.generatedMethods}</p>
          )}
        </fieldset>

        <fieldset className="rounded-lg bg-white p-4 shadow-sm">
          <legend className="px-1 font-semibold text-leaf-900">
            Entries: notes and cover photos
          </legend>
          <p className="text-sm text-loam-700">
            Mention spines or skin irritation in a note and the sheet adds the caution beside it.
          </p>
          <ul className="mt-2 space-y-4">
            {t.entries.map((e) => {
              const own = photoList.filter((p) => p.entryId === e.id);
              return (
                <li key={e.id} className="grid gap-2 text-sm sm:grid-cols-2">
                  <TextArea
                    label={`${e.name} — note`}
                    error={errors.entryNotes?.[e.id]?.message}
                    {...form.register(`entryNotes.${e.id}`)}
                  />
                  <SelectField
                    label="Cover photo"
                    options={[
                      ['', own.some((p) => p.isCover) ? "The gallery's cover photo" : 'No photo'],
                      ...own.map(
                        (p) => [p.id, `${p.caption} ${p.takenOn ? `(${p.takenOn})` : ''}`] as const,
                      ),
                    ]}
                    {...form.register(`coverPhotos.${e.id}`)}
                  />
                </li>
              );
            })}
          </ul>
        </fieldset>

        {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
        <div className="flex flex-wrap gap-2">
          <Button type="submit" disabled={isSubmitting}>
            {isSubmitting ? 'Saving…' : 'Save the draft'}
          </Button>
          <Button
            type="button"
            variant="secondary"
            onClick={() => {
              setShowPreview(true);
              setPreviewAsked((n) => n + 1);
            }}
          >
            Preview
          </Button>
        </div>
        {isSubmitSuccessful ? (
          <p role="status" className="text-sm text-leaf-700">
            Draft saved.
          </p>
        ) : null}
      </form>

      <PublishForm slug={slug} draft={d} />

      {showPreview ? (
        <section
          ref={previewRef}
          tabIndex={-1}
          className="mt-8 scroll-mt-4 border-t-4 border-pod-500 pt-4 focus:outline-none"
          aria-label="Preview"
        >
          {preview.isPending ? (
            <Spinner label="Computing the analysis for the preview…" />
          ) : preview.error ? (
            <ErrorPanel error={preview.error} />
          ) : (
            <SheetView sheet={preview.data!} preview />
          )}
        </section>
      ) : null}
    </div>
  );
}

/** Publishing freezes the saved draft as the next version, with a note on what changed. */
function PublishForm({ slug, draft: d }: { slug: string; draft: SheetDraft }) {
  const publish = usePublishSheet(slug);
  const unpublish = useUnpublishSheet(slug);
  const form = useContractForm(publishBody, { changeNote: '' });
  const onPublish = submitTo(form, ({ changeNote }) => publish.mutateAsync(changeNote));
  const refusal = formRefusal(form);
  const next = (d.publishedVersion ?? 0) + 1;
  return (
    <section
      className="mt-6 rounded-lg border-2 border-leaf-300 bg-white p-4"
      aria-labelledby="publish-heading"
    >
      <h2 id="publish-heading" className="text-xl font-semibold text-leaf-900">
        Publish
      </h2>
      <form noValidate aria-labelledby="publish-heading" onSubmit={onPublish}>
        <p className="mt-1 text-sm">
          Publishing freezes this sheet as version {next}. Later changes to records do not change a
          published version; publish a new one with a note on what changed. Save the draft first.
        </p>
        {d.publishedVersion ? (
          <TextField
            className="mt-2 text-sm"
            label={`What changed since version ${d.publishedVersion}`}
            error={form.formState.errors.changeNote?.message}
            {...form.register('changeNote')}
          />
        ) : null}
        {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
        {unpublish.error ? <ErrorPanel error={unpublish.error} /> : null}
        <div className="mt-3 flex flex-wrap gap-2">
          <Button type="submit" disabled={form.formState.isSubmitting}>
            {form.formState.isSubmitting ? 'Publishing…' : `Publish version ${next}`}
          </Button>
          {d.isPublic ? (
            <Button
              type="button"
              variant="danger"
              disabled={unpublish.isPending}
              onClick={() => unpublish.mutate()}
            >
              Unpublish
            </Button>
          ) : null}
        </div>
      </form>
      {publish.isSuccess ? (
        <p role="status" className="mt-2 text-sm">
          Published version {publish.data.version}:{' '}
          <Link to={`/r/${slug}`} className="font-semibold text-leaf-700 underline">
            open the public sheet
          </Link>
        </p>
      ) : null}
    </section>
  );
}
