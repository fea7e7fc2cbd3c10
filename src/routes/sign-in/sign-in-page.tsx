import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { redirect, useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import { loginBody } from '../../../shared/schemas/auth';
import { meQueryOptions } from '../../api/auth/me';
import { useSignIn } from '../../api/auth/sign-in';
import { Form, SubmitButton } from '../../components/form';
import { TextField } from '../../components/form-fields';
import { Notice } from '../../components/ui/notice';
import { Wordmark } from '../../components/wordmark';
import { plantQueryOptions, usePlant } from '../../api/plant/plant';
import { ApiError } from '../../lib/http';
import { paths, safeNext, SIGN_IN_NOTES, type SignInNote } from '../../lib/paths';
import { forgetEverything } from '../../lib/session';
import { useT } from '../../lib/i18n';

export const signInLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    // always ask the server: a sign-out or a lost session is exactly when the cache is out of date
    const me = await queryClient.fetchQuery({ ...meQueryOptions(), staleTime: 0 });
    if (me?.secondFactor.required && !me.secondFactor.enrolled) throw redirect(paths.secondFactor);
    if (me) throw redirect(safeNext(new URL(request.url).searchParams.get('next')));
    forgetEverything(queryClient);
    await queryClient.ensureQueryData(plantQueryOptions());
    return null;
  };

const isNote = (v: string | null): v is SignInNote => v !== null && v in SIGN_IN_NOTES;

export function SignInPage() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const signIn = useSignIn();
  // the password was right and this person has a second factor: ask for the code as well
  const [askCode, setAskCode] = useState(false);
  const next = safeNext(params.get('next'));
  const note = params.get('note');
  const plantName = usePlant().data?.name ?? '';
  // the language of whoever last signed in on this device (main.tsx), until someone signs in
  const t = useT();

  return (
    // anyone may be signing in on a dock or station tablet, so the form gets the large targets
    <main data-density="floor" className="flex min-h-screen items-start justify-center px-4 py-[12vh]">
      <div className="w-full max-w-[26rem]">
        <div className="mb-5 flex flex-col items-center gap-1 text-center">
          <Wordmark large />
          <p className="text-ink-soft">{plantName}</p>
        </div>
        <section
          aria-labelledby="sign-in-heading"
          className="rounded-card border border-rule bg-card px-6 py-6 shadow-card"
        >
          <h1 id="sign-in-heading" className="mb-4 text-xl font-semibold">
            {t('signIn.title')}
          </h1>
          {isNote(note) && (
            <div className="mb-4">
              <Notice tone={note === 'password-changed' ? 'ok' : 'info'} live="status">
                {t(`signIn.note.${note}`, undefined, SIGN_IN_NOTES[note])}
              </Notice>
            </div>
          )}
          <Form
            schema={loginBody}
            defaultValues={{ email: '', password: '' }}
            onSubmit={async (values) => {
              let me;
              try {
                me = await signIn.mutateAsync(values);
              } catch (err) {
                if (err instanceof ApiError && err.code === 'code_required') return setAskCode(true);
                throw err;
              }
              // an administrator without a second factor sets one up before anything else
              const enrol = me.secondFactor.required && !me.secondFactor.enrolled;
              const to = enrol ? `${paths.secondFactor}?${new URLSearchParams({ next })}` : next;
              await navigate(to, { replace: true });
            }}
          >
            <TextField
              name="email"
              label={t('signIn.email')}
              type="email"
              autoComplete="username"
              autoFocus={!askCode}
            />
            <TextField name="password" label={t('signIn.password')} type="password" autoComplete="current-password" />
            {askCode && (
              <>
                <Notice tone="info" live="status">
                  {t('signIn.codeAsk')}
                </Notice>
                <TextField
                  name="code"
                  label={t('signIn.code')}
                  inputMode="numeric"
                  autoComplete="one-time-code"
                  mono
                  optional
                  autoFocus
                  hint={t('signIn.codeHint')}
                />
              </>
            )}
            <SubmitButton size="lg" wide>
              {t('signIn.submit')}
            </SubmitButton>
          </Form>
        </section>
        <p className="mt-4 text-center text-sm text-ink-soft">{t('signIn.forgotten')}</p>
      </div>
    </main>
  );
}
