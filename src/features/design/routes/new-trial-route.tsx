import { createTrialBody, type CreateTrialBody } from '@common/contracts/design';
import { designLabels, trialDesigns } from '@common/contracts/trials';
import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { useMe } from '@/lib/session';
import { useCreateTrial } from '../api/create-trial';
import {
  fieldErrors,
  FormError,
  SelectField,
  TextArea,
  TextField,
} from '../components/form-fields';

export function Component() {
  const { data: me, isPending } = useMe();
  const create = useCreateTrial();
  const navigate = useNavigate();
  const [local, setLocal] = useState<Record<string, string>>({});
  if (isPending) return null;
  if (!me)
    return (
      <p>
        <Link to="/sign-in" className="font-semibold text-leaf-700 underline">
          Sign in
        </Link>{' '}
        to create a trial.
      </p>
    );
  const errors = { ...fieldErrors(create.error), ...local };

  function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const body: CreateTrialBody = {
      title: String(f.get('title') ?? ''),
      crop: String(f.get('crop') ?? ''),
      season: String(f.get('season') ?? ''),
      design: String(f.get('design')) as CreateTrialBody['design'],
      description: String(f.get('description') ?? ''),
      sowingDate: String(f.get('sowingDate') ?? '') || null,
      transplantDate: String(f.get('transplantDate') ?? '') || null,
      ...(f.get('leadEmail') ? { leadEmail: String(f.get('leadEmail')) } : {}),
    };
    const parsed = createTrialBody.safeParse(body);
    if (!parsed.success) {
      setLocal(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
      return;
    }
    setLocal({});
    create.mutate(body, { onSuccess: (r) => navigate(`/t/${r.slug}/entries`) });
  }

  return (
    <section className="max-w-2xl">
      <h1 className="text-3xl font-semibold text-leaf-900">New trial</h1>
      <p className="mt-2 text-loam-700">
        Name the trial and choose its design. Entries, sites and traits come next.
      </p>
      <form
        onSubmit={onSubmit}
        noValidate
        className="mt-4 space-y-4 rounded-xl bg-white p-4 shadow-sm"
      >
        <TextField label="Title" name="title" required error={errors.title} />
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Crop" name="crop" required placeholder="Okra" error={errors.crop} />
          <TextField
            label="Season"
            name="season"
            required
            placeholder="2027"
            error={errors.season}
          />
        </div>
        <SelectField
          label="Design"
          name="design"
          defaultValue="rcbd"
          error={errors.design}
          hint="Blocks: every block holds each entry once, in its own random order. Several sites: the blocks are repeated at each site."
          options={trialDesigns.map((d) => [d, designLabels[d]] as const)}
        />
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Sowing date" name="sowingDate" type="date" error={errors.sowingDate} />
          <TextField
            label="Transplant date (if transplanted)"
            name="transplantDate"
            type="date"
            error={errors.transplantDate}
          />
        </div>
        <TextArea label="Description" name="description" error={errors.description} />
        {me.isAdmin ? (
          <TextField
            label="Lead’s e-mail (administrators: create the trial for someone else)"
            name="leadEmail"
            type="email"
            hint="Leave blank to lead it yourself."
            error={errors.leadEmail}
          />
        ) : null}
        <FormError
          error={
            create.error && !Object.keys(fieldErrors(create.error)).length ? create.error : null
          }
        />
        <Button type="submit" disabled={create.isPending}>
          {create.isPending ? 'Creating…' : 'Create trial'}
        </Button>
      </form>
    </section>
  );
}
