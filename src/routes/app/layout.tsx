import { lazy, Suspense, useEffect } from 'react';
import { Link, NavLink, Outlet, redirect, useLocation, useNavigate, useNavigation } from 'react-router';
import type { LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { ROLE_LABELS } from '../../../shared/roles';
import { useSignedIn } from '../../api/auth/me';
import { setLanguage, useT } from '../../lib/i18n';
import { useSignOut } from '../../api/auth/sign-out';
import { Wordmark } from '../../components/wordmark';
import { Button } from '../../components/ui/button';
import { paths, signInHref } from '../../lib/paths';
import { plantQueryOptions, usePlant } from '../../api/plant/plant';
import { requireSignedIn } from '../../lib/session';
import { navAreasFor } from './areas';

// its own chunk: the station screen, which does not show it, downloads none of it
const SearchBox = lazy(async () => ({ default: (await import('../../components/search-box')).SearchBox }));

export const layoutLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const me = await requireSignedIn(queryClient, request);
    // an administrator without a second factor: the server opens nothing else to this session
    if (me.secondFactor.required && !me.secondFactor.enrolled) {
      const url = new URL(request.url);
      throw redirect(`${paths.secondFactor}?${new URLSearchParams({ next: `${url.pathname}${url.search}` })}`);
    }
    // after the session check: a sign-out clears the cache, which would cancel it mid-flight
    await queryClient.ensureQueryData(plantQueryOptions());
    return null;
  };

const navLinkClass = ({ isActive }: { isActive: boolean }) =>
  [
    'inline-flex h-11 items-center border-b-[3px] px-3 text-[0.95rem] floor:h-12 floor:px-4 floor:text-base',
    isActive
      ? 'border-accent font-semibold text-ink'
      : 'border-transparent text-ink-soft hover:border-rule-strong hover:text-ink',
  ].join(' ');

export function AppLayout() {
  const me = useSignedIn();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const navigation = useNavigation();
  const location = useLocation();
  const t = useT();
  const plantName = usePlant().data?.name ?? '';
  const spoken = me?.user.language;
  // the person's own language for every screen (Spanish is fetched the first time it is needed)
  useEffect(() => {
    if (spoken) void setLanguage(spoken);
  }, [spoken]);
  // between a sign-out and the sign-in page there is nobody to show
  if (!me) return null;
  const { user } = me;

  const onSignOut = () =>
    signOut.mutate(undefined, { onSettled: () => navigate(signInHref({ note: 'signed-out' }), { replace: true }) });

  return (
    // the size scale follows the device (pointer: coarse), not the role: see the floor variant in index.css
    <div className="flex min-h-screen flex-col print:block print:min-h-0">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-3 focus:top-3 focus:z-50 focus:rounded-control focus:bg-card focus:px-3 focus:py-2"
      >
        {t('nav.skip')}
      </a>
      <header className="border-b border-rule-strong bg-card print:hidden">
        <div className="mx-auto flex max-w-page flex-wrap items-center gap-x-5 gap-y-2 px-6 pt-3">
          <Link to={paths.home} className="rounded-control">
            <Wordmark />
          </Link>
          <span className="hidden border-l border-rule pl-4 text-sm text-ink-soft lg:inline">{plantName}</span>
          <div className="ml-auto flex items-center gap-3">
            {location.pathname !== paths.station && (
              <Suspense fallback={null}>
                <SearchBox key={location.search} />
              </Suspense>
            )}
            <p className="text-right leading-tight">
              <span className="block font-medium">{user.name}</span>
              <span className="block text-sm text-ink-soft">
                {t(`role.${user.role}`, undefined, ROLE_LABELS[user.role])}
              </span>
            </p>
            <NavLink
              to={paths.account}
              className={({ isActive }) =>
                `${isActive ? 'font-semibold text-ink underline' : 'text-accent'} inline-flex h-9 items-center rounded-control px-2 underline-offset-4 hover:underline floor:h-12 floor:px-3`
              }
            >
              {t('nav.account')}
            </NavLink>
            <Button variant="secondary" icon="signOut" onClick={onSignOut} disabled={signOut.isPending}>
              {t('nav.signOut')}
            </Button>
          </div>
        </div>
        <nav aria-label="Main" className="mx-auto mt-1 flex max-w-page flex-wrap gap-1 px-6">
          <NavLink to={paths.home} end className={navLinkClass}>
            {t('nav.home')}
          </NavLink>
          {navAreasFor(user.role).map((a) => (
            <NavLink key={a.to} to={a.to} className={navLinkClass}>
              {t(`nav.area.${a.label}`, undefined, a.label)}
            </NavLink>
          ))}
        </nav>
      </header>
      <div
        aria-hidden="true"
        className={`h-0.5 print:hidden ${navigation.state === 'loading' ? 'animate-pulse bg-accent' : 'bg-transparent'}`}
      />
      <main
        id="main"
        tabIndex={-1}
        aria-busy={navigation.state === 'loading'}
        // the page shown (set once its data has loaded): browser tests wait on it after an in-app move
        data-location={location.pathname + location.search}
        className="mx-auto w-full max-w-page flex-1 px-6 py-6 outline-none print:m-0 print:max-w-none print:p-0"
      >
        <Outlet />
      </main>
    </div>
  );
}
