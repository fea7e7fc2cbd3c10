import { zodResolver } from '@hookform/resolvers/zod';
import type { ReactNode } from 'react';
import {
  FormProvider,
  useForm,
  useFormContext,
  type DefaultValues,
  type FieldValues,
  type Path,
  type UseFormReturn,
} from 'react-hook-form';
import type { z } from 'zod';
import { ApiError } from '../lib/http';
import { t } from '../lib/i18n';
import { localizeText } from '../lib/server-messages';
import { Button, type ButtonVariant } from './ui/button';
import { Notice } from './ui/notice';

type Schema = z.ZodType<FieldValues, FieldValues>;

// the shared schemas carry their own wording; this only covers the cases they leave to zod. An
// empty choice (a select, a radio pair) arrives as undefined and is asked for as a choice.
const friendlyIssue = (issue: { code: string; expected?: unknown; input?: unknown }) => {
  const empty = issue.input === undefined || issue.input === '';
  if (issue.code === 'invalid_value' && empty) return t('common.chooseOne');
  if (issue.code !== 'invalid_type') return undefined;
  if (empty)
    return issue.expected === 'number' || issue.expected === 'boolean' ? t('common.chooseOne') : t('common.fillIn');
  if (issue.expected === 'number') return t('common.enterNumber');
  return undefined;
};

type FormProps<S extends Schema> = {
  schema: S;
  defaultValues?: DefaultValues<z.input<S>>;
  /** Throw (an ApiError) to keep the form open; its message and field notes are shown in place. */
  onSubmit: (values: z.output<S>) => Promise<unknown> | unknown;
  children: ReactNode;
};

/**
 * The one form wrapper: react-hook-form with the same zod schema the server validates with, and
 * the server's `{ message, fields }` mapped back onto the form when it says no.
 */
export function Form<S extends Schema>({ schema, defaultValues, onSubmit, children }: FormProps<S>) {
  const form = useForm<z.input<S>, unknown, z.output<S>>({
    resolver: zodResolver(schema, { error: friendlyIssue }),
    defaultValues,
    mode: 'onTouched',
  });

  const submit = form.handleSubmit(async (values) => {
    try {
      await onSubmit(values);
    } catch (err) {
      showServerError(form, err);
    }
  });

  return (
    <FormProvider {...form}>
      <form noValidate onSubmit={submit} className="flex flex-col gap-4">
        <FormAlert />
        {children}
      </form>
    </FormProvider>
  );
}

function showServerError<T extends FieldValues>(form: UseFormReturn<T, unknown, unknown>, err: unknown) {
  if (!(err instanceof ApiError)) {
    form.setError('root.server', { message: t('common.browserWrong') });
    return;
  }
  const known = new Set(Object.keys(form.getValues()));
  const stray: string[] = [];
  for (const [field, message] of Object.entries(err.fields)) {
    if (known.has(field)) form.setError(field as Path<T>, { type: 'server', message }, { shouldFocus: true });
    else stray.push(message);
  }
  form.setError('root.server', { message: [err.message, ...stray].join(' ') });
}

/** The server's answer, in its own words, at the top of the form. */
function FormAlert() {
  const { formState } = useFormContext();
  const message = formState.errors.root?.server?.message;
  if (!message) return null;
  return (
    <Notice tone="bad" live="alert">
      {localizeText(message)}
    </Notice>
  );
}

type SubmitProps = { children: ReactNode; variant?: ButtonVariant; size?: 'md' | 'lg'; wide?: boolean };

/** Keeps its name while busy (tests and screen readers find it by that name) and says "busy" instead. */
export function SubmitButton({ children, variant = 'primary', size = 'md', wide = false }: SubmitProps) {
  const { formState } = useFormContext();
  const button = (
    <Button
      type="submit"
      variant={variant}
      size={size}
      disabled={formState.isSubmitting}
      aria-busy={formState.isSubmitting}
    >
      {children}
    </Button>
  );
  return wide ? <div className="grid">{button}</div> : button;
}
