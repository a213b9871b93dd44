/**
 * The one way a form is built: react-hook-form with the zod resolver on the endpoint's form
 * contract from `common/contracts` (its messages are the form's messages), sent by `submitTo`,
 * which puts a refusal's field messages on the fields and anything else on the form itself.
 */
import { zodResolver } from '@hookform/resolvers/zod';
import { type DefaultValues, type FieldValues, useForm, type UseFormReturn } from 'react-hook-form';
import type { z } from 'zod';
import { ApiError } from './api-client';
import { showServerErrors } from './form-errors';

/** react-hook-form on a contract: the fields hold what is typed, submit hands on its output. */
export function useContractForm<S extends z.ZodType<FieldValues, FieldValues>>(
  schema: S,
  defaultValues: DefaultValues<z.input<S>>,
) {
  return useForm<z.input<S>, unknown, z.output<S>>({
    // The resolver's generic types cannot follow a schema given as a parameter.
    resolver: zodResolver(schema as never) as never,
    defaultValues,
  });
}

/**
 * The submit handler: checks the form, then sends its parsed values. A refusal naming the
 * form's fields shows beside them; any other (offline, permission, a rule across fields) shows
 * as the form's own message, `formRefusal(form)`.
 */
export function submitTo<I extends FieldValues, O>(
  form: UseFormReturn<I, unknown, O>,
  send: (values: O, event?: React.BaseSyntheticEvent) => Promise<unknown>,
) {
  return form.handleSubmit(async (values, event) => {
    form.clearErrors('root.server');
    try {
      await send(values, event);
    } catch (err) {
      const onFields =
        err instanceof ApiError &&
        Object.keys(err.fieldMessages).every((p) => form.getValues(p as never) !== undefined);
      if (!onFields || !showServerErrors(err, form.setError))
        form.setError('root.server', {
          message: err instanceof Error ? err.message : 'Not saved: try again.',
        });
    }
  });
}

/** The form's own message from its last submit, if it was refused. */
export const formRefusal = <I extends FieldValues, O>(form: UseFormReturn<I, unknown, O>) =>
  form.formState.errors.root?.server?.message;
