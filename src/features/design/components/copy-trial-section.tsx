import { copyTrialBody } from '@common/contracts/design';
import { useNavigate } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { FormMessage, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useCopyTrial } from '../api/copy-trial';

/** A season named by its year ("2026") is followed by the next year; any other name is kept. */
export function nextSeason(season: string): string {
  return /^\d{4}$/.test(season.trim()) ? String(Number(season.trim()) + 1) : season;
}

function nextTitle(title: string, season: string): string {
  const next = nextSeason(season);
  if (next !== season && title.includes(season)) return title.split(season).join(next);
  return `${title} (${next === season ? 'copy' : next})`;
}

/** Next season in one step: the same entries, sites, traits and settings, a new layout. */
export function CopyTrialSection({
  slug,
  title,
  season,
}: {
  slug: string;
  title: string;
  season: string;
}) {
  const copy = useCopyTrial(slug);
  const navigate = useNavigate();
  const form = useContractForm(copyTrialBody, {
    title: nextTitle(title, season),
    season: nextSeason(season),
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    const made = await copy.mutateAsync(body);
    navigate(`/t/${made.slug}`);
  });
  const refusal = formRefusal(form);
  return (
    <section
      aria-labelledby="copy-heading"
      className="mt-8 max-w-2xl rounded-xl bg-white p-4 shadow-sm"
    >
      <h2 id="copy-heading" className="text-lg font-semibold text-leaf-900">
        Copy this trial to next season
      </h2>
      <p className="mt-1 text-sm">
        A new trial with the same entries, sites, traits and settings (the results sheet's traits,
        alpha, letters and licence too), and a freshly randomized layout. Records, photos, members
        and results stay with this trial; you lead the copy and invite its growers again. The copy
        links back here. It stays in this trial's group when you coordinate that group; otherwise it
        goes to your own group, and its entries join that group's register by name.
      </p>
      <form noValidate onSubmit={onSubmit} className="mt-3 space-y-3">
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label="New trial title"
            error={errors.title?.message}
            {...form.register('title')}
          />
          <TextField label="Season" error={errors.season?.message} {...form.register('season')} />
        </div>
        {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Copying…' : 'Copy the trial'}
        </Button>
      </form>
    </section>
  );
}
