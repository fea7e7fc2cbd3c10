import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import { z } from 'zod';
import { secondFactorCode, type SecondFactorStart } from '../../../shared/schemas/auth';
import { useSignedIn } from '../../api/auth/me';
import { useConfirmSecondFactor, useStartSecondFactor } from '../../api/auth/second-factor';
import { useSignOut } from '../../api/auth/sign-out';
import { Form, SubmitButton } from '../../components/form';
import { TextField } from '../../components/form-fields';
import { Button } from '../../components/ui/button';
import { Notice } from '../../components/ui/notice';
import { Wordmark } from '../../components/wordmark';
import { paths, safeNext, signInHref } from '../../lib/paths';
import { requireSignedIn } from '../../lib/session';

export const secondFactorLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireSignedIn(queryClient, request);
    return null;
  };

const codeForm = z.object({ code: secondFactorCode });

/** The secret in groups of four, as an app's "enter a key" screen is easiest typed from. */
const grouped = (secret: string) => secret.match(/.{1,4}/g)?.join(' ') ?? secret;

/**
 * Setting up a second factor: scan a QR code with an authenticator app, type the code it shows,
 * keep the recovery codes. An administrator's first sign-in lands here and nothing else opens
 * until it is done; for everyone else it is offered on the account page.
 */
export function SecondFactorPage() {
  const me = useSignedIn();
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const start = useStartSecondFactor();
  const confirm = useConfirmSecondFactor();
  const signOut = useSignOut();
  const [shown, setShown] = useState<SecondFactorStart | null>(null);
  const [codes, setCodes] = useState<string[] | null>(null);
  const [kept, setKept] = useState(false);
  const next = safeNext(params.get('next'));
  if (!me) return null;
  const mustEnrol = me.secondFactor.required && !me.secondFactor.enrolled;

  return (
    <main data-density="floor" className="flex min-h-screen items-start justify-center px-4 py-[8vh]">
      <div className="w-full max-w-[34rem]">
        <div className="mb-5 flex flex-col items-center gap-1 text-center">
          <Wordmark large />
        </div>
        <section
          aria-labelledby="factor-heading"
          className="rounded-card border border-rule bg-card px-6 py-6 shadow-card"
        >
          <h1 id="factor-heading" className="mb-2 text-xl font-semibold">
            Set up your second factor
          </h1>
          {codes ? (
            <div className="flex flex-col gap-4">
              <Notice tone="ok" live="status" title="Your second factor is set up.">
                From now on you sign in with your password and the code your app shows.
              </Notice>
              <div>
                <h2 className="mb-1 font-semibold">Recovery codes</h2>
                <p className="mb-3 text-ink-soft">
                  Each signs you in once without your phone. Keep them somewhere safe, away from the phone: they are
                  shown only now.
                </p>
                <ol aria-label="Recovery codes" className="grid grid-cols-2 gap-x-6 gap-y-1.5 font-mono text-lg">
                  {codes.map((c) => (
                    <li key={c}>{c}</li>
                  ))}
                </ol>
              </div>
              <label className="flex min-h-11 floor:min-h-12 items-center gap-3">
                <input type="checkbox" className="h-6 w-6" checked={kept} onChange={(e) => setKept(e.target.checked)} />
                I have kept these codes somewhere safe
              </label>
              <Button
                variant="primary"
                size="lg"
                disabled={!kept}
                onClick={() => void navigate(next, { replace: true })}
              >
                Continue to Coretrail
              </Button>
            </div>
          ) : (
            <div className="flex flex-col gap-4">
              <p className="text-ink-soft">
                {mustEnrol
                  ? 'Administrators sign in with a password and a code from an authenticator app on their phone. Set it up now; nothing else opens until it is done.'
                  : 'Sign in with a password and a code from an authenticator app on your phone.'}
              </p>
              {!shown ? (
                <>
                  {start.error && (
                    <Notice tone="bad" live="alert">
                      {start.error.message}
                    </Notice>
                  )}
                  <Button
                    variant="primary"
                    size="lg"
                    disabled={start.isPending}
                    aria-busy={start.isPending}
                    onClick={() => start.mutate(undefined, { onSuccess: setShown })}
                  >
                    Show the QR code
                  </Button>
                </>
              ) : (
                <>
                  <ol className="ml-5 list-decimal space-y-1">
                    <li>Open an authenticator app on your phone and add an account by scanning this code.</li>
                    <li>Type the six digits the app shows for Coretrail below.</li>
                  </ol>
                  <img
                    src={`data:image/svg+xml;charset=utf-8,${encodeURIComponent(shown.qrSvg)}`}
                    alt="QR code to scan with an authenticator app"
                    width={220}
                    height={220}
                    className="self-center rounded-control border border-rule bg-white"
                  />
                  <p className="text-sm text-ink-soft">
                    Cannot scan? Enter this key in the app instead:{' '}
                    <span className="font-mono text-base text-ink" data-testid="factor-secret">
                      {grouped(shown.secret)}
                    </span>
                  </p>
                  <Form
                    schema={codeForm}
                    defaultValues={{ code: '' }}
                    onSubmit={async ({ code }) => setCodes((await confirm.mutateAsync(code)).recoveryCodes)}
                  >
                    <TextField
                      name="code"
                      label="Code from the app"
                      inputMode="numeric"
                      autoComplete="one-time-code"
                      mono
                      autoFocus
                    />
                    <SubmitButton size="lg" wide>
                      Confirm
                    </SubmitButton>
                  </Form>
                </>
              )}
              {mustEnrol ? (
                <Button
                  variant="quiet"
                  onClick={() =>
                    signOut.mutate(undefined, {
                      onSettled: () => void navigate(signInHref({ note: 'signed-out' }), { replace: true }),
                    })
                  }
                >
                  Sign out and do it later
                </Button>
              ) : (
                <Link to={paths.account} className="text-accent underline-offset-4 hover:underline">
                  Back to your account
                </Link>
              )}
            </div>
          )}
        </section>
      </div>
    </main>
  );
}
