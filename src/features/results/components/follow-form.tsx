import { followBody } from '@common/contracts/results';
import { Button } from '@/components/ui/button';
import { FormMessage, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useFollowResults } from '../api/follow-results';

/** A reader asks to be told by e-mail when a trial publishes new results. */
export function FollowForm({ slug }: { slug: string }) {
  const follow = useFollowResults(slug);
  const form = useContractForm(followBody, { email: '' });
  const onSubmit = submitTo(form, ({ email }) => follow.mutateAsync(email));
  const refusal = formRefusal(form);
  if (follow.isSuccess) {
    return (
      <p role="status" className="rounded-lg bg-leaf-50 p-3">
        {follow.data.message} Open the link in it to start following.
      </p>
    );
  }
  return (
    <form className="space-y-2" noValidate onSubmit={onSubmit}>
      <div className="flex flex-col gap-2 sm:flex-row sm:items-start">
        <TextField
          className="flex-1 text-sm"
          label="E-mail me when new results are published"
          type="email"
          autoComplete="email"
          error={form.formState.errors.email?.message}
          {...form.register('email')}
        />
        <Button type="submit" className="sm:mt-7" disabled={form.formState.isSubmitting}>
          {form.formState.isSubmitting ? 'Sending…' : 'Follow'}
        </Button>
      </div>
      {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
    </form>
  );
}
