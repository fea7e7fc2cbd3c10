import { Link } from 'react-router';
import { ROLE_LABELS, ROLE_SUMMARIES } from '../../../shared/roles';
import { useSignedIn } from '../../api/auth/me';
import { PageHeader } from '../../components/page-header';
import { ScanBox, useOpenItem } from '../../components/scan-box';
import { Card, CardBody } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { useT } from '../../lib/i18n';
import { paths } from '../../lib/paths';
import { areasFor, comingFor } from '../app/areas';
import { WaitingForYou } from './waiting-for-you';
import { LineHome } from './line-home';
import { ExpiringQualifications } from './expiring-qualifications';
import { homeWords } from './screen-words';

/** The home's words are there before its first render (Spanish fetched when the person reads it). */
export const homeLoader = () => homeWords().then(() => null);

type Tile = { label: string; to: string; summary: string };

// the roles that pick up a part and need to know what it is before anything else
const SCANS_FIRST = new Set(['receiving', 'operator']);

function AreaCard({ tile }: { tile: Tile }) {
  return (
    <li>
      <Link
        to={tile.to}
        className="group flex h-full flex-col rounded-card border border-rule bg-card p-5 shadow-card hover:border-accent floor:min-h-32"
      >
        <span className="flex items-center justify-between gap-2 text-lg font-semibold text-ink group-hover:text-accent">
          {tile.label}
          <Icon name="arrowRight" className="text-accent" />
        </span>
        <span className="mt-1.5 text-ink-soft">{tile.summary}</span>
      </Link>
    </li>
  );
}

export function HomePage() {
  const me = useSignedIn();
  const openItem = useOpenItem();
  const t = useT();
  if (!me) return null;
  const role = me.user.role;
  const tiles: Tile[] = [
    ...areasFor(role).map((a) => ({
      label: t(`nav.area.${a.label}`, undefined, a.label),
      to: a.to,
      summary: t(`home.area.${a.label}`, undefined, a.summary),
    })),
    { label: t('home.account'), to: paths.account, summary: t('home.accountSummary') },
  ];
  const coming = comingFor(role);

  return (
    <>
      <PageHeader
        title={t('home.title', { role: t(`role.${role}`, undefined, ROLE_LABELS[role]) })}
        description={t(`home.role.${role}`, undefined, ROLE_SUMMARIES[role])}
      />
      {SCANS_FIRST.has(role) && (
        <section aria-labelledby="scan-heading" className="mb-8">
          <Card as="div">
            <CardBody>
              <h2 id="scan-heading" className="mb-2 text-lg font-semibold">
                {t('home.find')}
              </h2>
              <ScanBox onItem={openItem} preview={false} autoFocus />
            </CardBody>
          </Card>
        </section>
      )}
      <LineHome me={me} />
      <ExpiringQualifications me={me} />
      <WaitingForYou me={me} />
      <section aria-labelledby="now-heading" className="mb-8">
        <h2 id="now-heading" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-soft">
          {t('home.now')}
        </h2>
        <ul className="grid grid-cols-1 gap-4 sm:grid-cols-2 xl:grid-cols-3">
          {tiles.map((t) => (
            <AreaCard key={t.to} tile={t} />
          ))}
        </ul>
      </section>
      {coming.length > 0 && (
        <Card labelledBy="coming-heading">
          <div className="px-5 py-4">
            <h2 id="coming-heading" className="text-lg font-semibold">
              Coming to your role
            </h2>
            <p className="mt-0.5 text-sm text-ink-soft">
              Not built yet. These arrive in later releases of Coretrail; nothing here is live.
            </p>
            <ul className="mt-3 divide-y divide-rule border-t border-rule">
              {coming.map((c) => (
                <li key={c.label} className="flex flex-col gap-0.5 py-2.5 sm:flex-row sm:gap-4">
                  <span className="font-medium sm:w-44 sm:shrink-0">{c.label}</span>
                  <span className="text-ink-soft">{c.summary}</span>
                </li>
              ))}
            </ul>
          </div>
        </Card>
      )}
    </>
  );
}
