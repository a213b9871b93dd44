import { type CopyTrialBody, copyTrialBody } from '@common/contracts/design';
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { useNavigate } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { showServerErrors } from '@/lib/form-errors';
import { useCopyTrial } from '../api/copy-trial';
import { TextField } from './form-fields';

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
  const [problem, setProblem] = useState<string | null>(null);
  const form = useForm<z.input<typeof copyTrialBody>, unknown, CopyTrialBody>({
    resolver: zodResolver(copyTrialBody),
    defaultValues: { title: nextTitle(title, season), season: nextSeason(season) },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setProblem(null);
    try {
      const made = await copy.mutateAsync(body);
      navigate(`/t/${made.slug}`);
    } catch (err) {
      if (!showServerErrors(err, form.setError))
        setProblem(err instanceof Error ? err.message : 'The trial could not be copied.');
    }
  });
  return (
    <section
      aria-labelledby="copy-heading"
      className="mt-8 max-w-2xl rounded-xl bg-white p-4 shadow-sm"
    >
      <h2 id="copy-heading" className="text-lg font-semibold text-leaf-900">
        Copy this trial to next season
      </h2>
      <p className="mt-1 text-sm">
        A new trial with the same entries, sites, traits and settings, and a freshly randomized
        layout. Records, photos, members and results stay with this trial; you lead the copy and
        invite its growers again. The copy links back here.
      </p>
      <form noValidate onSubmit={(e) => void onSubmit(e)} className="mt-3 space-y-3">
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label="New trial title"
            error={errors.title?.message}
            {...form.register('title')}
          />
          <TextField label="Season" error={errors.season?.message} {...form.register('season')} />
        </div>
        {problem ? (
          <p role="alert" className="text-sm text-frost-600">
            {problem}
          </p>
        ) : null}
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Copying…' : 'Copy the trial'}
        </Button>
      </form>
    </section>
  );
}
