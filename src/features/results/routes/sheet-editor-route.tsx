import { licenseLabels, licenses, type SaveSheetBody } from '@common/contracts/results';
import {
  basisLabels,
  analysisBases,
  defaultModelFor,
  modelLabels,
  modelsForDesign,
  type AnalysisModel,
} from '@common/contracts/analysis';
import { useEffect, useRef, useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { ApiError } from '@/lib/api-client';
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

const field = 'mt-1 min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-3';

function FieldErrors({ error }: { error: unknown }) {
  if (!(error instanceof ApiError)) return error ? <ErrorPanel error={error} /> : null;
  return (
    <div role="alert" className="rounded-lg border border-frost-600/40 bg-white p-3 text-sm">
      <p className="font-semibold text-frost-600">{error.message}</p>
      {error.fields.length > 1 ? (
        <ul className="mt-1 list-disc pl-5">
          {error.fields.map((f) => (
            <li key={f.path}>{f.message}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const draft = useSheetDraft(slug);
  const photos = useTrialPhotos(slug);
  const save = useSaveSheet(slug);
  const publish = usePublishSheet(slug);
  const unpublish = useUnpublishSheet(slug);
  const [form, setForm] = useState<SaveSheetBody | null>(null);
  const [ownMethods, setOwnMethods] = useState(false);
  const [changeNote, setChangeNote] = useState('');
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

  useEffect(() => {
    if (draft.data && !form) {
      const { generatedMethods: _g, publishedVersion: _p, isPublic: _i, ...body } = draft.data;
      setForm(body);
      setOwnMethods(body.methods !== null);
    }
  }, [draft.data, form]);

  if (trial.isPending || draft.isPending || !form)
    return draft.error ? (
      <ErrorPanel error={draft.error} />
    ) : (
      <Spinner label="Loading the results sheet…" />
    );
  if (trial.error) return <ErrorPanel error={trial.error} />;
  const t = trial.data;
  const d = draft.data!;
  const chosen = new Map(form.traits.map((x, i) => [x.key, i]));
  const set = (patch: Partial<SaveSheetBody>) => setForm({ ...form, ...patch });
  const move = (i: number, by: number) => {
    const traits = [...form.traits];
    const j = i + by;
    if (j < 0 || j >= traits.length) return;
    [traits[i], traits[j]] = [traits[j]!, traits[i]!];
    set({ traits });
  };
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
        onSubmit={(e) => {
          e.preventDefault();
          save.mutate({
            ...form,
            methods: ownMethods ? (form.methods ?? d.generatedMethods) : null,
          });
        }}
      >
        <fieldset className="rounded-lg bg-white p-4 shadow-sm">
          <legend className="px-1 font-semibold text-leaf-900">
            Traits, order and ranking weights
          </legend>
          <ul className="space-y-2">
            {t.traits.map((trait) => {
              const i = chosen.get(trait.key);
              const on = i !== undefined;
              const choice = on ? form.traits[i] : undefined;
              return (
                <li
                  key={trait.key}
                  className="flex flex-wrap items-center gap-2 border-b border-leaf-50 pb-2"
                >
                  <label className="flex min-h-11 flex-1 items-center gap-2">
                    <input
                      type="checkbox"
                      className="h-5 w-5"
                      checked={on}
                      onChange={(e) =>
                        set({
                          traits: e.target.checked
                            ? [...form.traits, { key: trait.key, basis: 'plot', weight: 1 }]
                            : form.traits.filter((x) => x.key !== trait.key),
                        })
                      }
                    />
                    {trait.label}
                  </label>
                  {choice ? (
                    <>
                      <label className="text-sm">
                        Basis{' '}
                        <select
                          className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
                          value={choice.basis}
                          onChange={(e) =>
                            set({
                              traits: form.traits.map((x) =>
                                x.key === trait.key
                                  ? { ...x, basis: e.target.value as typeof x.basis }
                                  : x,
                              ),
                            })
                          }
                        >
                          {analysisBases.map((b) => (
                            <option key={b} value={b}>
                              {basisLabels[b]}
                            </option>
                          ))}
                        </select>
                      </label>
                      <label className="text-sm">
                        Weight{' '}
                        <input
                          type="number"
                          inputMode="decimal"
                          min={0}
                          max={10}
                          step={0.5}
                          className="min-h-11 w-20 rounded-lg border border-leaf-300 px-2"
                          value={choice.weight}
                          onChange={(e) =>
                            set({
                              traits: form.traits.map((x) =>
                                x.key === trait.key ? { ...x, weight: Number(e.target.value) } : x,
                              ),
                            })
                          }
                        />
                      </label>
                      <Button
                        type="button"
                        variant="ghost"
                        aria-label={`Move ${trait.label} up`}
                        onClick={() => move(i!, -1)}
                      >
                        ↑
                      </Button>
                      <Button
                        type="button"
                        variant="ghost"
                        aria-label={`Move ${trait.label} down`}
                        onClick={() => move(i!, 1)}
                      >
                        ↓
                      </Button>
                    </>
                  ) : null}
                </li>
              );
            })}
          </ul>
          <div className="mt-3 grid gap-3 sm:grid-cols-3">
            <label className="text-sm font-medium">
              Significance level (α)
              <input
                type="number"
                inputMode="decimal"
                step="any"
                min={0.001}
                max={0.2}
                className={field}
                value={form.alpha}
                onChange={(e) => set({ alpha: Number(e.target.value) })}
              />
            </label>
            <label className="text-sm font-medium">
              Letters from
              <select
                className={field}
                value={form.letters}
                onChange={(e) => set({ letters: e.target.value as 'hsd' | 'lsd' })}
              >
                <option value="hsd">Tukey's HSD</option>
                <option value="lsd">Fisher's LSD</option>
              </select>
            </label>
            <label className="text-sm font-medium">
              Model
              <select
                className={field}
                value={form.model ?? ''}
                onChange={(e) =>
                  set({ model: e.target.value === '' ? null : (e.target.value as AnalysisModel) })
                }
              >
                <option value="">
                  As the design suggests ({modelLabels[defaultModelFor(t.design)]})
                </option>
                {modelsForDesign(t.design).map((m) => (
                  <option key={m} value={m}>
                    {modelLabels[m]}
                  </option>
                ))}
              </select>
            </label>
            <label className="text-sm font-medium">
              Licence of the published numbers
              <select
                className={field}
                value={form.license}
                onChange={(e) => set({ license: e.target.value as SaveSheetBody['license'] })}
              >
                {licenses.map((l) => (
                  <option key={l} value={l}>
                    {licenseLabels[l]}
                  </option>
                ))}
              </select>
            </label>
          </div>
        </fieldset>

        <label className="block rounded-lg bg-white p-4 font-semibold text-leaf-900 shadow-sm">
          Summary
          <textarea
            className={`${field} min-h-32 py-2 font-normal text-ink`}
            value={form.summary}
            onChange={(e) => set({ summary: e.target.value })}
          />
        </label>

        <fieldset className="rounded-lg bg-white p-4 shadow-sm">
          <legend className="px-1 font-semibold text-leaf-900">Methods</legend>
          <label className="flex min-h-11 items-center gap-2">
            <input
              type="checkbox"
              className="h-5 w-5"
              checked={ownMethods}
              onChange={(e) => setOwnMethods(e.target.checked)}
            />
            Write my own methods paragraph
          </label>
          {ownMethods ? (
            <textarea
              aria-label="Methods"
              className={`${field} min-h-40 py-2`}
              value={form.methods ?? d.generatedMethods}
              onChange={(e) => set({ methods: e.target.value })}
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
                <li key={e.id} className="grid gap-2 sm:grid-cols-2">
                  <label className="text-sm font-medium">
                    {e.name} — note
                    <textarea
                      className={`${field} min-h-20 py-2 font-normal`}
                      value={form.entryNotes[e.id] ?? ''}
                      onChange={(ev) =>
                        set({ entryNotes: { ...form.entryNotes, [e.id]: ev.target.value } })
                      }
                    />
                  </label>
                  <label className="text-sm font-medium">
                    Cover photo
                    <select
                      className={field}
                      value={form.coverPhotos[e.id] ?? ''}
                      onChange={(ev) => {
                        const coverPhotos = { ...form.coverPhotos };
                        if (ev.target.value) coverPhotos[e.id] = ev.target.value;
                        else delete coverPhotos[e.id];
                        set({ coverPhotos });
                      }}
                    >
                      <option value="">
                        {own.some((p) => p.isCover) ? "The gallery's cover photo" : 'No photo'}
                      </option>
                      {own.map((p) => (
                        <option key={p.id} value={p.id}>
                          {p.caption} {p.takenOn ? `(${p.takenOn})` : ''}
                        </option>
                      ))}
                    </select>
                  </label>
                </li>
              );
            })}
          </ul>
        </fieldset>

        <FieldErrors error={save.error} />
        <div className="flex flex-wrap gap-2">
          <Button type="submit" disabled={save.isPending}>
            {save.isPending ? 'Saving…' : 'Save the draft'}
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
        {save.isSuccess ? (
          <p role="status" className="text-sm text-leaf-700">
            Draft saved.
          </p>
        ) : null}
      </form>

      <section
        className="mt-6 rounded-lg border-2 border-leaf-300 bg-white p-4"
        aria-labelledby="publish-heading"
      >
        <h2 id="publish-heading" className="text-xl font-semibold text-leaf-900">
          Publish
        </h2>
        <p className="mt-1 text-sm">
          Publishing freezes this sheet as version {(d.publishedVersion ?? 0) + 1}. Later changes to
          records do not change a published version; publish a new one with a note on what changed.
          Save the draft first.
        </p>
        {d.publishedVersion ? (
          <label className="mt-2 block text-sm font-medium">
            What changed since version {d.publishedVersion}
            <input
              className={field}
              value={changeNote}
              onChange={(e) => setChangeNote(e.target.value)}
            />
          </label>
        ) : null}
        <FieldErrors error={publish.error ?? unpublish.error} />
        <div className="mt-3 flex flex-wrap gap-2">
          <Button
            type="button"
            disabled={publish.isPending}
            onClick={() => publish.mutate(changeNote)}
          >
            {publish.isPending ? 'Publishing…' : `Publish version ${(d.publishedVersion ?? 0) + 1}`}
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
        {publish.isSuccess ? (
          <p role="status" className="mt-2 text-sm">
            Published version {publish.data.version}:{' '}
            <Link to={`/r/${slug}`} className="font-semibold text-leaf-700 underline">
              open the public sheet
            </Link>
          </p>
        ) : null}
      </section>

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
