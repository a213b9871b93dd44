import {
  type GerminationTest,
  germinationTestForm,
  lotForm,
  type LotFormValues,
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
import { formatMass, fromStored } from '@common/units';
import { localToday } from '@common/calendar-date';
import { createColumnHelper } from '@tanstack/react-table';
import {
  createContext,
  type RefObject,
  useContext,
  useEffect,
  useMemo,
  useRef,
  useState,
} from 'react';
import { Link, useParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { DataTable } from '@/components/ui/data-table';
import { ErrorPanel } from '@/components/ui/error-panel';
import { TODAY_HINT } from '@/components/ui/field-date';
import { Spinner } from '@/components/ui/spinner';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { FormMessage, SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useUnitSystem } from '@/lib/session';
import { addGerminationTest } from '../api/add-germination-test';
import { answerSeedRequest } from '../api/answer-seed-request';
import { closeOffer } from '../api/close-offer';
import { createLot } from '../api/create-lot';
import { createOffer } from '../api/create-offer';
import { deleteGerminationTest } from '../api/delete-germination-test';
import { useSeedRequests } from '../api/get-seed-requests';
import { useSeedChanged, useVarietySeed } from '../api/get-variety-seed';
import { updateLot } from '../api/update-lot';
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

type StandPlot = SeedLot['sown'][number]['plots'][number];
const standColumn = createColumnHelper<StandPlot>();
const standColumns = [
  standColumn.accessor('site', { header: 'Site' }),
  standColumn.accessor('plotNumber', { id: 'plot', header: 'Plot', meta: { align: 'right' } }),
  standColumn.accessor((p) => p.plantsSet ?? undefined, {
    id: 'set',
    header: 'Plants set',
    sortUndefined: 'last',
    meta: { align: 'right' },
    cell: (c) => c.getValue() ?? '—',
  }),
  standColumn.accessor((p) => p.plantsSurviving ?? undefined, {
    id: 'standing',
    header: 'Standing',
    sortUndefined: 'last',
    meta: { align: 'right' },
    cell: (c) => c.getValue() ?? '—',
  }),
];

const testColumn = createColumnHelper<GerminationTest>();
const testColumns = [
  testColumn.accessor('testedOn', {
    header: 'Read on',
    meta: { cellClassName: () => 'whitespace-nowrap' },
  }),
  testColumn.accessor('seedsGerminated', {
    header: 'Germinated',
    meta: { align: 'right' },
    cell: (c) => `${c.getValue()} of ${c.row.original.seedsTested}`,
  }),
  testColumn.accessor('days', { header: 'Days', meta: { align: 'right' } }),
  testColumn.accessor('percent', {
    header: 'Germination (95 % interval)',
    meta: { align: 'right' },
    cell: (c) => <GerminationFigure test={c.row.original} />,
  }),
];

/** What the Delete cells read: kept out of the columns, so the columns never change. */
const TestDeletes = createContext<{
  deleting: string | null;
  remove: (test: GerminationTest) => void;
} | null>(null);

function DeleteTestButton({ test }: { test: GerminationTest }) {
  const deletes = useContext(TestDeletes)!;
  const deleting = deletes.deleting === test.id;
  // aria-disabled, not disabled: a disabled button drops the keyboard focus while it waits.
  return (
    <Button
      type="button"
      variant="ghost"
      data-germination-test={test.id}
      aria-disabled={deleting || undefined}
      aria-label={`Delete the test read on ${test.testedOn}`}
      onClick={() => {
        if (!deleting) deletes.remove(test);
      }}
    >
      {deleting ? 'Deleting…' : 'Delete'}
    </Button>
  );
}

const editableTestColumns = [
  ...testColumns,
  testColumn.display({
    id: 'delete',
    // A visible header: a visually hidden one would stick out of the scroll frame at 360 px.
    header: 'Delete',
    cell: (c) => <DeleteTestButton test={c.row.original} />,
  }),
];

/**
 * A lot's germination tests, newest first; a coordinator may delete one entered by mistake. The
 * keyboard focus then goes to the next row's Delete (the previous one after the last row), or to
 * `heading` once no test is left.
 */
function TestsTable({
  lot,
  canEdit,
  heading,
}: {
  lot: SeedLot;
  canEdit: boolean;
  heading: RefObject<HTMLHeadingElement | null>;
}) {
  const changed = useSeedChanged();
  const [deleting, setDeleting] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const table = useRef<HTMLDivElement>(null);
  const focusNext = useRef<string | null>(null);
  useEffect(() => {
    const next = focusNext.current;
    if (next === null || lot.tests.some((t) => t.id === deleting)) return;
    focusNext.current = null;
    table.current?.querySelector<HTMLElement>(`[data-germination-test="${next}"]`)?.focus();
  }, [lot.tests, deleting]);
  const deletes = useMemo(() => {
    const remove = async (test: GerminationTest) => {
      const what = `the germination test of lot ${lot.label} read on ${test.testedOn} (${test.seedsGerminated} of ${test.seedsTested} germinated)`;
      if (!window.confirm(`Delete ${what}? This cannot be undone.`)) return;
      const at = lot.tests.findIndex((t) => t.id === test.id);
      const next = lot.tests[at + 1] ?? lot.tests[at - 1];
      setDeleting(test.id);
      setProblem(null);
      try {
        await deleteGerminationTest(lot.id, test.id);
        // The last test gone, this table goes too: the lot's "Germination tests" heading holds it.
        if (next) focusNext.current = next.id;
        await changed();
        if (!next) heading.current?.focus();
      } catch (err) {
        setProblem(err instanceof Error ? err.message : 'Not deleted: try again.');
      } finally {
        setDeleting(null);
      }
    };
    return { deleting, remove: (test: GerminationTest) => void remove(test) };
  }, [lot.id, lot.label, lot.tests, deleting, changed, heading]);
  return (
    <TestDeletes.Provider value={deletes}>
      {problem ? <FormMessage tone="error">{problem}</FormMessage> : null}
      <ScrollRegion label={`Germination tests of lot ${lot.label}`} className="mt-1">
        <div ref={table}>
          <DataTable
            caption={`Germination tests of lot ${lot.label}`}
            data={lot.tests}
            columns={canEdit ? editableTestColumns : testColumns}
            rowId={(t) => t.id}
            rowHeader="testedOn"
            className="min-w-[28rem] text-sm"
          />
        </div>
      </ScrollRegion>
    </TestDeletes.Provider>
  );
}

function LotCard({ slug, lot, canEdit }: { slug: string; lot: SeedLot; canEdit: boolean }) {
  const [editing, setEditing] = useState(false);
  const testsHeading = useRef<HTMLHeadingElement>(null);
  if (editing) return <LotForm slug={slug} lot={lot} onDone={() => setEditing(false)} />;
  return (
    <section className={card} aria-labelledby={`lot-${lot.id}`}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 id={`lot-${lot.id}`} className="text-lg font-semibold text-leaf-900">
          Lot {lot.label}
        </h3>
        {canEdit ? (
          <Button
            type="button"
            variant="secondary"
            aria-label={`Change lot ${lot.label}`}
            onClick={() => setEditing(true)}
          >
            Change
          </Button>
        ) : null}
      </div>
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
      <h4 ref={testsHeading} tabIndex={-1} className="mt-3 font-semibold">
        Germination tests
      </h4>
      {lot.tests.length === 0 ? (
        <p className="text-sm text-loam-700">None yet.</p>
      ) : (
        <TestsTable lot={lot} canEdit={canEdit} heading={testsHeading} />
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
              <ScrollRegion
                label={`Plots of ${s.trialTitle} sown from lot ${lot.label}`}
                className="mt-1"
              >
                <DataTable
                  caption={`Stand of the plots of ${s.trialTitle} sown from lot ${lot.label}`}
                  data={s.plots}
                  columns={standColumns}
                  rowId={(p) => `${p.site}-${p.plotNumber}`}
                  rowHeader="plot"
                  className="min-w-[20rem] text-sm"
                />
              </ScrollRegion>
            ) : null}
          </div>
        ))
      )}
    </section>
  );
}

/** What the lot form starts with: blank for a new lot, else the lot's own values as typed text. */
function lotDefaults(lot: SeedLot | undefined, system: 'metric' | 'us'): LotFormValues {
  if (!lot)
    return {
      label: '',
      source: '',
      harvestYear: '',
      amount: '',
      amountUnit: system === 'us' ? 'oz' : 'g',
      storagePlace: '',
      notes: '',
    };
  // A mass is shown in the reader's units: ounces to two decimals in US units.
  const unit = lot.amountUnit === 'seeds' ? 'seeds' : system === 'us' ? 'oz' : 'g';
  const amount =
    lot.amount === null
      ? ''
      : unit === 'oz'
        ? String(Math.round(fromStored(lot.amount, 'oz') * 100) / 100)
        : String(lot.amount);
  return {
    label: lot.label,
    source: lot.source,
    harvestYear: lot.harvestYear === null ? '' : String(lot.harvestYear),
    amount,
    amountUnit: unit,
    storagePlace: lot.storagePlace,
    notes: lot.notes,
  };
}

/** Adds a lot, or changes one: then only the fields changed are sent, so an amount shown in
 * ounces and left alone is not rounded into the stored grams. */
function LotForm({ slug, lot, onDone }: { slug: string; lot?: SeedLot; onDone: () => void }) {
  const system = useUnitSystem();
  const changed = useSeedChanged();
  const [defaults] = useState(() => lotDefaults(lot, system));
  const form = useContractForm(lotForm, defaults);
  const { errors, isSubmitting } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    if (lot) {
      const typed = form.getValues();
      const differs = (k: keyof LotFormValues) => typed[k] !== defaults[k];
      const changes = {
        ...(differs('label') ? { label: body.label } : {}),
        ...(differs('source') ? { source: body.source } : {}),
        ...(differs('harvestYear') ? { harvestYear: body.harvestYear } : {}),
        ...(differs('amount') || differs('amountUnit')
          ? { amount: body.amount, amountUnit: body.amountUnit }
          : {}),
        ...(differs('storagePlace') ? { storagePlace: body.storagePlace } : {}),
        ...(differs('notes') ? { notes: body.notes } : {}),
      };
      if (Object.keys(changes).length) await updateLot(lot.id, changes);
    } else {
      await createLot(slug, body);
      form.reset(defaults);
    }
    await changed();
    onDone();
  });
  const title = lot ? `Change lot ${lot.label}` : 'Add a lot';
  return (
    <form onSubmit={onSubmit} noValidate className={`${card} space-y-3`} aria-label={title}>
      <h3 className="text-lg font-semibold text-leaf-900">{title}</h3>
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
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Saving…' : lot ? 'Save the changes' : 'Save the lot'}
        </Button>
        <Button type="button" variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
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
  const [problem, setProblem] = useState<string | null>(null);
  const [closing, setClosing] = useState(false);
  const close = async (offerId: string) => {
    setClosing(true);
    setProblem(null);
    try {
      await closeOffer(offerId);
      await changed();
    } catch (err) {
      setProblem(err instanceof Error ? err.message : 'Not closed: try again.');
    } finally {
      setClosing(false);
    }
  };
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
              {problem ? <FormMessage tone="error">{problem}</FormMessage> : null}
              <Button
                type="button"
                variant="secondary"
                className="mt-3"
                disabled={closing}
                onClick={() => void close(open.id)}
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
        <LotCard key={lot.id} slug={slug} lot={lot} canEdit={seed.canEdit} />
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
