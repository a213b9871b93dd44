import { createTrialForm } from '@common/contracts/design';
import { designLabels, trialDesigns } from '@common/contracts/trials';
import { useEffect } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { FormMessage, SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useGroups } from '@/lib/groups';
import { useMe } from '@/lib/session';
import { useCreateTrial } from '../api/create-trial';

export function Component() {
  const { data: me, isPending } = useMe();
  const create = useCreateTrial();
  const navigate = useNavigate();
  const form = useContractForm(createTrialForm, {
    title: '',
    crop: '',
    season: '',
    design: 'rcbd',
    description: '',
    sowingDate: '',
    transplantDate: '',
    leadEmail: '',
    groupId: '',
  });
  const { errors, isSubmitting } = form.formState;
  const { data: groups } = useGroups(Boolean(me));
  // Someone coordinating several groups chooses where the trial goes; otherwise the server's default.
  const coordinated = groups?.groups.filter((g) => g.myRole === 'coordinator') ?? [];
  const choose = coordinated.length > 1;
  const firstGroup = choose ? coordinated[0]!.id : '';
  useEffect(() => {
    if (firstGroup && !form.getValues('groupId')) form.setValue('groupId', firstGroup);
  }, [firstGroup, form]);
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

  const onSubmit = submitTo(form, async (body) => {
    const r = await create.mutateAsync(body);
    navigate(`/t/${r.slug}/entries`);
  });
  const refusal = formRefusal(form);

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
        <TextField
          label="Title"
          required
          error={errors.title?.message}
          {...form.register('title')}
        />
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label="Crop"
            required
            placeholder="Okra"
            error={errors.crop?.message}
            {...form.register('crop')}
          />
          <TextField
            label="Season"
            required
            placeholder="2027"
            error={errors.season?.message}
            {...form.register('season')}
          />
        </div>
        {choose ? (
          <SelectField
            label="Group"
            hint="The group whose register the trial's varieties join; you coordinate each of these."
            error={errors.groupId?.message}
            options={coordinated.map((g) => [g.id, g.name] as const)}
            {...form.register('groupId')}
          />
        ) : null}
        <SelectField
          label="Design"
          error={errors.design?.message}
          hint="Blocks: every block holds each entry once, in its own random order. Several sites: the blocks are repeated at each site."
          options={trialDesigns.map((d) => [d, designLabels[d]] as const)}
          {...form.register('design')}
        />
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label="Sowing date"
            type="date"
            error={errors.sowingDate?.message}
            {...form.register('sowingDate')}
          />
          <TextField
            label="Transplant date (if transplanted)"
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
        {me.isAdmin ? (
          <TextField
            label="Lead’s e-mail (administrators: create the trial for someone else)"
            type="email"
            hint="Leave blank to lead it yourself."
            error={errors.leadEmail?.message}
            {...form.register('leadEmail')}
          />
        ) : null}
        {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Creating…' : 'Create trial'}
        </Button>
      </form>
    </section>
  );
}
