import { type Offer, seedRequestForm, seedRequestStatusLabels } from '@common/contracts/seed';
import { Link, useLocation, useParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { FormMessage, TextArea } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useOffer } from '../api/get-offer';
import { useSeedChanged } from '../api/get-variety-seed';
import { requestPacket } from '../api/request-packet';
import { GerminationFigure } from '../components/germination-figure';

function RequestForm({ offer }: { offer: Offer }) {
  const changed = useSeedChanged();
  const form = useContractForm(seedRequestForm, { shipTo: '', message: '' });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    await requestPacket(offer.id, body);
    await changed();
  });
  return (
    <form onSubmit={onSubmit} noValidate className="mt-4 space-y-3" aria-label="Ask for a packet">
      <TextArea
        label="Send the packet to"
        hint="A postal address, or where you will collect it."
        autoComplete="street-address"
        error={errors.shipTo?.message}
        {...form.register('shipTo')}
      />
      <TextArea
        label="Message to the coordinator (optional)"
        error={errors.message?.message}
        {...form.register('message')}
      />
      {formRefusal(form) ? <FormMessage tone="error">{formRefusal(form)}</FormMessage> : null}
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Sending…' : 'Ask for a packet'}
      </Button>
    </form>
  );
}

export function Component() {
  const { offerId = '' } = useParams();
  const location = useLocation();
  const { data: offer, isPending, error } = useOffer(offerId);
  if (isPending) return <Spinner label="Loading the offer…" />;
  if (error) return <ErrorPanel error={error} title="This offer is not available" />;
  return (
    <div className="mx-auto max-w-2xl rounded-xl bg-white p-4 shadow-sm sm:p-6">
      <p className="text-sm uppercase tracking-wide text-loam-700">
        {offer.variety.crop} · {offer.group.name}
      </p>
      <h1 className="text-3xl font-semibold text-leaf-900">Seed of {offer.variety.name}</h1>
      <p className="mt-2">
        {offer.status === 'open'
          ? `${offer.packetsLeft} of ${offer.packetsOffered} packets left`
          : 'This offer is closed.'}
        {' · '}lot {offer.lot.label}
        {offer.lot.harvestYear ? `, harvested ${offer.lot.harvestYear}` : ''}
      </p>
      {offer.lot.lastTest ? (
        <p className="mt-1 text-sm">
          Germination on {offer.lot.lastTest.testedOn}:{' '}
          <GerminationFigure test={offer.lot.lastTest} /> (95 % interval)
        </p>
      ) : null}
      {offer.note ? <p className="mt-2 whitespace-pre-line">{offer.note}</p> : null}
      {offer.myRequest ? (
        <p role="status" className="mt-4 rounded-lg bg-leaf-50 p-3">
          Your request: {seedRequestStatusLabels[offer.myRequest.status]}
          {offer.myRequest.answer ? ` — “${offer.myRequest.answer}”` : ''}
        </p>
      ) : null}
      {offer.canRequest ? (
        <RequestForm offer={offer} />
      ) : offer.whyNot && !offer.myRequest ? (
        <p className="mt-4">
          {offer.whyNot}{' '}
          {offer.whyNot.startsWith('Sign in') ? (
            <Link
              className="font-medium text-leaf-700 underline"
              to={`/sign-in?next=${encodeURIComponent(location.pathname)}`}
            >
              Sign in
            </Link>
          ) : null}
        </p>
      ) : null}
      {offer.canManage ? (
        <p className="mt-4">
          <Link
            className="font-medium text-leaf-700 underline"
            to={`/varieties/${offer.variety.slug}/seed`}
          >
            Requests and lots of {offer.variety.name}
          </Link>
        </p>
      ) : null}
    </div>
  );
}
