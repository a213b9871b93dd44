import {
  germinationTestForm,
  lotForm,
  offerForm,
  type OfferSummary,
  type SeedLot,
  seedRequestStatusLabels,
  seedSettingsForm,
  typedAmountUnitLabels,
  typedAmountUnits,
  type VarietySeed,
} from '@common/contracts/seed';
import { formatPercent } from '@common/seed-lots';
import { formatMass } from '@common/units';
import { localToday } from '@common/calendar-date';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { TODAY_HINT } from '@/components/ui/field-date';
import { Spinner } from '@/components/ui/spinner';
import { FormMessage, SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useUnitSystem } from '@/lib/session';
import { addGerminationTest } from '../api/add-germination-test';
import { answerSeedRequest } from '../api/answer-seed-request';
import { closeOffer } from '../api/close-offer';
import { createLot } from '../api/create-lot';
import { createOffer } from '../api/create-offer';
import { useSeedRequests } from '../api/get-seed-requests';
import { useSeedChanged, useVarietySeed } from '../api/get-variety-seed';
import { updateSeedSettings } from '../api/update-seed-settings';
import { GerminationFigure } from '../components/germination-figure';

const card = 'rounded-xl bg-white p-4 shadow-sm';

function Amount({ lot }: { lot: SeedLot }) {
  const system = useUnitSystem();
  if (lot.amount === null) return <>amount not recorded</>;
  return (
    <>
      {lot.amountUnit === 'g'
        ? formatMass(lot.amount, system)
        : `${lot.amount.toLocaleString('en')} seeds`}
    </>
  );
}

function TestForm({ lotId }: { lotId: string }) {
  const changed = useSeedChanged();
  const blank = {
    testedOn: localToday(),
    seedsTested: '',
    seedsGerminated: '',
    days: '',
    notes: '',
  };
  const form = useContractForm(germinationTestForm, blank);
  const { errors, isSubmitting } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    await addGerminationTest(lotId, body);
    form.reset(blank);
    await changed();
  });
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      className="mt-3 space-y-3"
      aria-label="Add a germination test"
    >
      <div className="grid gap-3 sm:grid-cols-4">
        <TextField
          label="Test read on"
          type="date"
          hint={TODAY_HINT}
          max={localToday()}
          error={errors.testedOn?.message}
          {...form.register('testedOn')}
        />
        <TextField
          label="Seeds tested"
          inputMode="numeric"
          error={errors.seedsTested?.message}
          {...form.register('seedsTested')}
        />
        <TextField
          label="Seeds germinated"
          inputMode="numeric"
          error={errors.seedsGerminated?.message}
          {...form.register('seedsGerminated')}
        />
        <TextField
          label="Days"
          inputMode="numeric"
          suffix="days"
          error={errors.days?.message}
          {...form.register('days')}
        />
      </div>
      <TextField label="Notes" error={errors.notes?.message} {...form.register('notes')} />
      {formRefusal(form) ? <FormMessage tone="error">{formRefusal(form)}</FormMessage> : null}
      <Button type="submit" variant="secondary" disabled={isSubmitting}>
        {isSubmitting ? 'Saving…' : 'Add the test'}
      </Button>
    </form>
  );
}

function LotCard({ lot, canEdit }: { lot: SeedLot; canEdit: boolean }) {
  return (
    <section className={card} aria-labelledby={`lot-${lot.id}`}>
      <h3 id={`lot-${lot.id}`} className="text-lg font-semibold text-leaf-900">
        Lot {lot.label}
      </h3>
      <p className="text-sm text-loam-700">
        {[
          lot.source || null,
          lot.harvestYear ? `harvested ${lot.harvestYear}` : null,
          lot.storagePlace ? `stored: ${lot.storagePlace}` : null,
        ]
          .filter(Boolean)
          .join(' · ')}
      </p>
      <p className="mt-1">
        <Amount lot={lot} />
      </p>
      {lot.notes ? <p className="mt-1 text-sm">{lot.notes}</p> : null}
      {lot.warnings.map((w) => (
        <p
          key={w.kind}
          role="note"
          className="mt-2 rounded-lg border-l-4 border-pod-500 bg-straw-100 p-2 text-sm"
        >
          {w.message}
        </p>
      ))}
      <h4 className="mt-3 font-semibold">Germination tests</h4>
      {lot.tests.length === 0 ? (
        <p className="text-sm text-loam-700">None yet.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="mt-1 w-full text-sm">
            <thead>
              <tr className="text-left">
                <th className="py-1 pr-3">Read on</th>
                <th className="py-1 pr-3">Germinated</th>
                <th className="py-1 pr-3">Days</th>
                <th className="py-1">Germination (95 % interval)</th>
              </tr>
            </thead>
            <tbody>
              {lot.tests.map((t) => (
                <tr key={t.id} className="border-t border-straw-200">
                  <td className="py-1 pr-3">{t.testedOn}</td>
                  <td className="py-1 pr-3">
                    {t.seedsGerminated} of {t.seedsTested}
                  </td>
                  <td className="py-1 pr-3">{t.days}</td>
                  <td className="py-1">
                    <GerminationFigure test={t} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {canEdit ? <TestForm lotId={lot.id} /> : null}
      <h4 className="mt-4 font-semibold">Sown in trials</h4>
      {lot.sown.length === 0 ? (
        <p className="text-sm text-loam-700">
          No trial entry names this lot yet (a trial’s lead sets it on the trial’s entries).
        </p>
      ) : (
        lot.sown.map((s) => (
          <div key={`${s.trialSlug}-${s.entryName}`} className="mt-2">
            <p>
              <Link className="font-medium text-leaf-700 underline" to={`/t/${s.trialSlug}`}>
                {s.trialTitle}
              </Link>{' '}
              ({s.season}
              {s.sowingDate ? `, sown ${s.sowingDate}` : ''}) as “{s.entryName}”:{' '}
              {s.standPercent === null
                ? 'no stand counts recorded'
                : `stand ${formatPercent(s.standPercent)} of plants set`}
            </p>
            {s.plots.length ? (
              <div className="overflow-x-auto">
                <table className="mt-1 text-sm">
                  <thead>
                    <tr className="text-left">
                      <th className="py-1 pr-3">Site</th>
                      <th className="py-1 pr-3">Plot</th>
                      <th className="py-1 pr-3">Plants set</th>
                      <th className="py-1">Standing</th>
                    </tr>
                  </thead>
                  <tbody>
                    {s.plots.map((p) => (
                      <tr key={`${p.site}-${p.plotNumber}`} className="border-t border-straw-200">
                        <td className="py-1 pr-3">{p.site}</td>
                        <td className="py-1 pr-3">{p.plotNumber}</td>
                        <td className="py-1 pr-3">{p.plantsSet ?? '—'}</td>
                        <td className="py-1">{p.plantsSurviving ?? '—'}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            ) : null}
          </div>
        ))
      )}
    </section>
  );
}

function LotForm({ slug, onDone }: { slug: string; onDone: () => void }) {
  const system = useUnitSystem();
  const changed = useSeedChanged();
  const blank = {
    label: '',
    source: '',
    harvestYear: '',
    amount: '',
    amountUnit: system === 'us' ? ('oz' as const) : ('g' as const),
    storagePlace: '',
    notes: '',
  };
  const form = useContractForm(lotForm, blank);
  const { errors, isSubmitting } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    await createLot(slug, body);
    form.reset(blank);
    await changed();
    onDone();
  });
  return (
    <form onSubmit={onSubmit} noValidate className={`${card} space-y-3`} aria-label="Add a lot">
      <h3 className="text-lg font-semibold text-leaf-900">Add a lot</h3>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Lot label" error={errors.label?.message} {...form.register('label')} />
        <TextField label="Source" error={errors.source?.message} {...form.register('source')} />
        <TextField
          label="Harvest year"
          inputMode="numeric"
          error={errors.harvestYear?.message}
          {...form.register('harvestYear')}
        />
        <TextField
          label="Storage place"
          error={errors.storagePlace?.message}
          {...form.register('storagePlace')}
        />
        <TextField
          label="Amount"
          inputMode="decimal"
          error={errors.amount?.message}
          {...form.register('amount')}
        />
        <SelectField
          label="Amount in"
          options={typedAmountUnits.map((u) => [u, typedAmountUnitLabels[u]] as const)}
          error={errors.amountUnit?.message}
          {...form.register('amountUnit')}
        />
      </div>
      <TextArea label="Notes" error={errors.notes?.message} {...form.register('notes')} />
      {formRefusal(form) ? <FormMessage tone="error">{formRefusal(form)}</FormMessage> : null}
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Saving…' : 'Save the lot'}
      </Button>
    </form>
  );
}

function SettingsForm({ seed }: { seed: VarietySeed }) {
  const changed = useSeedChanged();
  const values = {
    germinationThresholdPercent: String(seed.settings.germinationThresholdPercent),
    requestsOpen: seed.settings.requestsOpen,
  };
  const form = useContractForm(seedSettingsForm, values);
  const { errors, isSubmitting, isSubmitSuccessful } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    await updateSeedSettings(seed.group.id, body);
    await changed();
  });
  return (
    <form onSubmit={onSubmit} noValidate className={`${card} space-y-3`} aria-label="Seed settings">
      <h3 className="text-lg font-semibold text-leaf-900">{seed.group.name}’s seed settings</h3>
      <TextField
        label="Flag a lot whose last test germinated below"
        inputMode="numeric"
        suffix="%"
        error={errors.germinationThresholdPercent?.message}
        {...form.register('germinationThresholdPercent')}
      />
      <label className="flex min-h-11 items-center gap-2">
        <input type="checkbox" className="h-5 w-5" {...form.register('requestsOpen')} />
        Anyone signed in with a confirmed e-mail may ask for offered seed (not only members)
      </label>
      {formRefusal(form) ? <FormMessage tone="error">{formRefusal(form)}</FormMessage> : null}
      {isSubmitSuccessful ? <FormMessage tone="ok">Settings saved.</FormMessage> : null}
      <Button type="submit" variant="secondary" disabled={isSubmitting}>
        Save the settings
      </Button>
    </form>
  );
}

function OfferForm({ slug, lots }: { slug: string; lots: SeedLot[] }) {
  const changed = useSeedChanged();
  const blank = { lotId: lots[0]?.id ?? '', packets: '', note: '' };
  const form = useContractForm(offerForm, blank);
  const { errors, isSubmitting } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    await createOffer(slug, body);
    form.reset(blank);
    await changed();
  });
  if (lots.length === 0)
    return <p className="text-sm text-loam-700">Add a lot to offer seed from it.</p>;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label="Offer seed">
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField
          label="From lot"
          options={lots.map((l) => [l.id, l.label] as const)}
          error={errors.lotId?.message}
          {...form.register('lotId')}
        />
        <TextField
          label="Packets offered"
          inputMode="numeric"
          error={errors.packets?.message}
          {...form.register('packets')}
        />
      </div>
      <TextArea label="Note to members" error={errors.note?.message} {...form.register('note')} />
      {formRefusal(form) ? <FormMessage tone="error">{formRefusal(form)}</FormMessage> : null}
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Saving…' : 'Offer packets'}
      </Button>
    </form>
  );
}

function Requests({ offer }: { offer: OfferSummary }) {
  const { data, isPending, error } = useSeedRequests(offer.id);
  const changed = useSeedChanged();
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState<string | null>(null);
  if (isPending) return <Spinner label="Loading the requests…" />;
  if (error) return <ErrorPanel error={error} />;
  const answer = async (id: string, status: 'sent' | 'declined') => {
    setBusy(id);
    setProblem(null);
    try {
      await answerSeedRequest(id, { status });
      await changed();
    } catch (err) {
      setProblem(err instanceof Error ? err.message : 'Not saved: try again.');
    } finally {
      setBusy(null);
    }
  };
  return (
    <div className="mt-3">
      <h4 className="font-semibold">Requests</h4>
      {problem ? <FormMessage tone="error">{problem}</FormMessage> : null}
      {data.requests.length === 0 ? (
        <p className="text-sm text-loam-700">No requests yet.</p>
      ) : (
        <ul className="mt-1 space-y-2">
          {data.requests.map((r) => (
            <li key={r.id} className="rounded-lg border border-straw-200 p-3">
              <p className="font-medium">
                {r.requester.name} ({r.requester.email}) ·{' '}
                <span>{seedRequestStatusLabels[r.status]}</span>
              </p>
              <p className="whitespace-pre-line text-sm">Send to: {r.shipTo}</p>
              {r.message ? <p className="text-sm">“{r.message}”</p> : null}
              {r.status === 'requested' ? (
                <div className="mt-2 flex flex-wrap gap-2">
                  <Button
                    type="button"
                    disabled={busy === r.id}
                    onClick={() => void answer(r.id, 'sent')}
                  >
                    Mark {r.requester.name}’s packet sent
                  </Button>
                  <Button
                    type="button"
                    variant="secondary"
                    disabled={busy === r.id}
                    onClick={() => void answer(r.id, 'declined')}
                  >
                    Decline
                  </Button>
                </div>
              ) : null}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

function Offers({ seed, slug }: { seed: VarietySeed; slug: string }) {
  const changed = useSeedChanged();
  const open = seed.offers.find((o) => o.status === 'open');
  return (
    <section className={card} aria-labelledby="offer-heading">
      <h2 id="offer-heading" className="text-xl font-semibold text-leaf-900">
        Seed offered to members
      </h2>
      {open ? (
        <div className="mt-2">
          <p>
            From lot {open.lotLabel}: {open.packetsLeft} of {open.packetsOffered} packets left.{' '}
            <Link className="font-medium text-leaf-700 underline" to={`/offers/${open.id}`}>
              The offer’s page
            </Link>
          </p>
          {open.note ? <p className="text-sm">{open.note}</p> : null}
          {seed.canEdit ? (
            <>
              <Requests offer={open} />
              <Button
                type="button"
                variant="secondary"
                className="mt-3"
                onClick={() => void closeOffer(open.id).then(changed)}
              >
                Close the offer
              </Button>
            </>
          ) : null}
        </div>
      ) : seed.canEdit ? (
        <OfferForm slug={slug} lots={seed.lots} />
      ) : (
        <p className="text-sm text-loam-700">No seed of this variety is offered now.</p>
      )}
    </section>
  );
}

export function Component() {
  const { slug = '' } = useParams();
  const { data: seed, isPending, error } = useVarietySeed(slug);
  const [adding, setAdding] = useState(false);
  if (isPending) return <Spinner label="Loading the seed…" />;
  if (error) return <ErrorPanel error={error} title="This variety’s seed is not available" />;
  return (
    <div className="mx-auto max-w-4xl space-y-4">
      <header>
        <p className="text-sm text-loam-700">
          <Link to={`/varieties/${slug}`} className="underline">
            {seed.variety.name}’s record across trials
          </Link>
        </p>
        <p className="text-sm uppercase tracking-wide text-loam-700">
          {seed.variety.crop} · {seed.group.name}
        </p>
        <h1 className="text-3xl font-semibold text-leaf-900">Seed of {seed.variety.name}</h1>
      </header>
      <Offers seed={seed} slug={slug} />
      <h2 className="text-xl font-semibold text-leaf-900">Lots</h2>
      {seed.lots.length === 0 ? <p>No lots recorded yet.</p> : null}
      {seed.lots.map((lot) => (
        <LotCard key={lot.id} lot={lot} canEdit={seed.canEdit} />
      ))}
      {seed.canEdit ? (
        adding ? (
          <LotForm slug={slug} onDone={() => setAdding(false)} />
        ) : (
          <Button type="button" variant="secondary" onClick={() => setAdding(true)}>
            Add a lot
          </Button>
        )
      ) : null}
      {seed.canEdit ? <SettingsForm seed={seed} /> : null}
    </div>
  );
}
