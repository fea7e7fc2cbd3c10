import { isRouteErrorResponse, Link, useLocation, useRouteError } from 'react-router';
import { ApiError } from '../../lib/http';
import { paths } from '../../lib/paths';
import { buttonClass } from '../../components/ui/button';
import { Icon } from '../../components/ui/icon';
import { Wordmark } from '../../components/wordmark';

function explain(error: unknown): { title: string; text: string; detail?: string; retry?: boolean } {
  if (isRouteErrorResponse(error)) {
    if (error.status === 404) return { title: 'Page not found', text: 'There is no page at this address.' };
    if (error.status === 403)
      return {
        title: 'Not part of your role',
        text: 'Your role does not open this page. If your work needs it, ask an administrator.',
      };
    return {
      title: 'This page could not be shown',
      text: `The server answered ${error.status} ${error.statusText}.`,
      retry: true,
    };
  }
  if (error instanceof ApiError) {
    if (error.status === 403) return { title: 'Not part of your role', text: error.message };
    return {
      title: 'This page could not be loaded',
      text: error.message,
      detail: error.requestId ? `Request id ${error.requestId}` : undefined,
      retry: true,
    };
  }
  return {
    title: 'Something went wrong',
    text: 'Coretrail hit a problem showing this page. Going home and trying again usually helps.',
    retry: true,
  };
}

function ErrorContent({ error }: { error: unknown }) {
  const { title, text, detail, retry } = explain(error);
  const { pathname } = useLocation();
  return (
    <section
      aria-labelledby="error-heading"
      className="mx-auto max-w-xl rounded-card border border-rule bg-card p-6 shadow-card"
    >
      <h1 id="error-heading" className="flex items-center gap-2 text-2xl font-semibold">
        <Icon name="alert" size={24} className="text-bad" />
        {title}
      </h1>
      <p className="mt-2 text-ink-soft">{text}</p>
      <p className="mt-1 font-mono text-sm text-ink-faint">{pathname}</p>
      {detail && <p className="mt-1 font-mono text-sm text-ink-faint">{detail}</p>}
      <div className="mt-5 flex flex-wrap gap-2">
        <Link to={paths.home} className={buttonClass('primary')}>
          Go to home
        </Link>
        {retry && (
          <button type="button" className={buttonClass('secondary')} onClick={() => window.location.reload()}>
            Try again
          </button>
        )}
      </div>
    </section>
  );
}

/** Inside the app layout: the header and navigation stay, only the page area shows the problem. */
export function RouteError() {
  return <ErrorContent error={useRouteError()} />;
}

/** When even the layout could not be shown (or before sign-in): the whole page. */
export function RootError() {
  const error = useRouteError();
  return (
    <main className="px-4 py-[10vh]">
      <div className="mb-5 flex justify-center">
        <Wordmark large />
      </div>
      <ErrorContent error={error} />
    </main>
  );
}

export function NotFoundPage() {
  const { pathname } = useLocation();
  return (
    <section
      aria-labelledby="nf-heading"
      className="mx-auto max-w-xl rounded-card border border-rule bg-card p-6 shadow-card"
    >
      <h1 id="nf-heading" className="text-2xl font-semibold">
        Page not found
      </h1>
      <p className="mt-2 text-ink-soft">
        There is no page at <span className="font-mono text-ink">{pathname}</span>. It may have moved, or the link has a
        typing slip.
      </p>
      <div className="mt-5">
        <Link to={paths.home} className={buttonClass('primary')}>
          Go to home
        </Link>
      </div>
    </section>
  );
}
