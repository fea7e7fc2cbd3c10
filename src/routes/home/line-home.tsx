import { useState } from 'react';
import { Link } from 'react-router';
import type { WipItem } from '../../../shared/schemas/line';
import type { SignedIn } from '../../api/auth/me';
import { useAlerts, useNcrAges, useShipping, useTeardownQueue, useWip } from '../../api/line/line';
import { useStations } from '../../api/reference/stations';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Select } from '../../components/ui/select';
import { plural } from '../../lib/format';
import { t } from '../../lib/i18n';
import { coreHref, itemHref, paths } from '../../lib/paths';
import { WIP_STATE_WORDS, formatAge } from '../line/words';

const linkRow =
  'flex min-h-11 floor:min-h-12 flex-wrap items-center gap-x-3 gap-y-0.5 py-1.5 text-accent underline-offset-4 hover:underline';

function Count({ n, label }: { n: number | undefined; label: string }) {
  return (
    <div className="min-w-24">
      <div className="font-mono text-3xl font-semibold tabular-nums text-ink">{n ?? '…'}</div>
      <div className="text-sm text-ink-soft">{label}</div>
    </div>
  );
}

function Empty({ children }: { children: string }) {
  return <p className="text-ink-soft">{children}</p>;
}

/** An age as `formatAge` gives it, in the screen's language. */
function ageWords(hours: number): string {
  if (hours < 1) return t('home.age.min', { n: Math.max(0, Math.round(hours * 60)) }, formatAge(hours));
  if (hours < 48) return t('home.age.h', { n: Math.round(hours) }, formatAge(hours));
  return t('home.age.days', { n: Math.round(hours / 24) }, formatAge(hours));
}

function PartLine({ item }: { item: WipItem }) {
  const tone = item.state === 'on_hold' ? 'hold' : item.state === 'in_work' ? 'accent' : 'wait';
  return (
    <Link to={itemHref(item.serial)} className={linkRow}>
      <span className="font-mono font-semibold">{item.serial}</span>
      <Badge tone={tone}>{t(`home.wip.${item.state}`, undefined, WIP_STATE_WORDS[item.state])}</Badge>
      <span className="text-ink-soft">
        {item.familyCode} · {ageWords(item.ageHours)}
      </span>
    </Link>
  );
}

/** The operator's station: what waits there, oldest first. The station is the one this tablet keeps. */
function StationQueue() {
  const stations = (useStations().data ?? []).filter((s) => s.active && s.stageCode);
  const [chosen, setChosen] = useState<string | null>(() => {
    try {
      return window.localStorage.getItem('coretrail.station');
    } catch {
      return null;
    }
  });
  const code = chosen ?? stations[0]?.code ?? null;
  const wip = useWip({ station: code ?? undefined }, code !== null);
  const items = wip.data?.items ?? [];
  return (
    <Card labelledBy="queue-heading">
      <CardHeader
        id="queue-heading"
        title={t('home.queue.title', { n: code && wip.data ? wip.data.itemCount : '…' })}
        description={t('home.queue.description')}
        actions={
          <label className="flex items-center gap-2 text-sm">
            <span>{t('home.queue.station')}</span>
            <Select
              value={code ?? ''}
              onChange={(e) => setChosen(e.target.value)}
              options={stations.map((s) => ({ value: s.code, label: `${s.code} · ${s.name}` }))}
            />
          </label>
        }
      />
      <CardBody>
        {items.length === 0 ? (
          <Empty>{t('home.queue.empty')}</Empty>
        ) : (
          <ul className="divide-y divide-rule">
            {items.slice(0, 15).map((i) => (
              <li key={i.serial}>
                <PartLine item={i} />
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}

function TeardownQueue() {
  const q = useTeardownQueue();
  const rows = q.data?.rows ?? [];
  return (
    <Card labelledBy="teardown-q-heading">
      <CardHeader
        id="teardown-q-heading"
        title={t('home.teardown.title', { n: q.data?.total ?? '…' })}
        description={t('home.teardown.description')}
      />
      <CardBody>
        {rows.length === 0 ? (
          <Empty>{t('home.teardown.empty')}</Empty>
        ) : (
          <ul className="divide-y divide-rule">
            {rows.slice(0, 12).map((r) => (
              <li key={r.serial}>
                <Link to={coreHref(r.serial)} className={linkRow}>
                  <span className="font-mono font-semibold">{r.serial}</span>
                  <span className="text-ink">
                    {r.familyCode} · {t('home.teardown.casting', { number: r.castingNumber })}
                  </span>
                  <span className="text-ink-soft">
                    {t('home.teardown.received', { day: r.receivedOn, count: r.ageDays })}
                  </span>
                </Link>
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}

function NcrAges() {
  const q = useNcrAges();
  const open = q.data?.buckets.reduce((s, b) => s + b.count, 0);
  return (
    <Card labelledBy="ncr-age-heading">
      <CardHeader
        id="ncr-age-heading"
        title={`Open NCRs by age (${open ?? '…'})`}
        description="Raised, in review or decided and not yet closed."
        actions={
          <Link to={`${paths.ncrs}?state=open&sort=raised&dir=asc`} className="text-accent underline">
            All open NCRs
          </Link>
        }
      />
      <CardBody>
        <div className="mb-3 flex flex-wrap gap-6">
          {(q.data?.buckets ?? []).map((b) => (
            <Count key={b.label} n={b.count} label={b.label} />
          ))}
        </div>
        {q.data && q.data.oldest.length > 0 && (
          <>
            <h3 className="mt-2 text-sm font-semibold text-ink-soft">Oldest</h3>
            <ul className="divide-y divide-rule">
              {q.data.oldest.map((n) => (
                <li key={n.number}>
                  <Link to={`/ncrs/${encodeURIComponent(n.number)}`} className={linkRow}>
                    <span className="font-mono font-semibold">{n.number}</span>
                    <span className="font-mono text-ink">{n.serial ?? n.lotCode}</span>
                    <span className="text-ink-soft">
                      {plural(n.ageDays, 'day')} · {n.state.replace(/_/g, ' ')}
                    </span>
                  </Link>
                </li>
              ))}
            </ul>
          </>
        )}
      </CardBody>
    </Card>
  );
}

export function Alerts() {
  const q = useAlerts();
  const list = q.data?.alerts ?? [];
  return (
    <Card labelledBy="alerts-heading">
      <CardHeader
        id="alerts-heading"
        title={`Alerts (${q.data?.total ?? '…'})`}
        description={
          q.data
            ? `NCRs open over ${plural(q.data.ncrOverdueDays, 'day')}; parts on hold over ${plural(q.data.holdAlertHours, 'hour')} (plant settings).`
            : 'Overdue NCRs and old holds.'
        }
      />
      <CardBody>
        {list.length === 0 ? (
          <Empty>No NCR is overdue and no hold is past its limit.</Empty>
        ) : (
          <ul className="divide-y divide-rule">
            {list.slice(0, 10).map((a) => (
              <li key={a.link}>
                <Link
                  to={a.link}
                  className="flex min-h-11 floor:min-h-12 items-start gap-x-2 py-1.5 text-accent underline-offset-4 hover:underline"
                >
                  <Icon name="alert" size={18} className="mt-0.5 shrink-0" />
                  <span className="min-w-0">{a.message}</span>
                </Link>
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}

/** The floor at a glance: counts per stage, and the oldest parts at each stage one tap away. */
function FloorSummary() {
  const wip = useWip({});
  const stages = (wip.data?.stages ?? []).filter((s) => s.waiting + s.inWork + s.onHold > 0);
  const items = wip.data?.items ?? [];
  const total = (k: 'waiting' | 'inWork' | 'onHold') => wip.data?.stages.reduce((s, r) => s + r[k], 0);
  return (
    <Card labelledBy="floor-heading">
      <CardHeader
        id="floor-heading"
        title="Work in process"
        description="Parts and units at each stage now; the oldest first."
        actions={
          <Link to={paths.wip} className="text-accent underline">
            Open the board
          </Link>
        }
      />
      <CardBody>
        <div className="mb-4 flex flex-wrap gap-6">
          <Count n={total('waiting')} label="waiting" />
          <Count n={total('inWork')} label="in work" />
          <Count n={total('onHold')} label="on hold" />
        </div>
        {stages.length === 0 ? (
          <Empty>Nothing is in process.</Empty>
        ) : (
          <ul className="divide-y divide-rule">
            {stages.map((s) => (
              <li key={s.stageCode} className="flex flex-wrap items-center gap-x-4 py-1">
                <h3 className="min-w-52 font-semibold">
                  {s.stageName}{' '}
                  <span className="block text-sm font-normal text-ink-soft">
                    {s.waiting} waiting · {s.inWork} in work · {s.onHold} on hold
                  </span>
                </h3>
                <ul className="flex flex-wrap gap-x-4">
                  {items
                    .filter((i) => i.stageCode === s.stageCode)
                    .slice(0, 2)
                    .map((i) => (
                      <li key={i.serial}>
                        <PartLine item={i} />
                      </li>
                    ))}
                </ul>
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}

function ShippingLists() {
  const q = useShipping();
  const ready = q.data?.ready ?? [];
  const blocked = q.data?.blocked ?? [];
  return (
    <>
      <Card labelledBy="ready-heading">
        <CardHeader
          id="ready-heading"
          title={`Ready to release (${q.data ? ready.length : '…'})`}
          description="Built units the release gate lets go."
        />
        <CardBody>
          {ready.length === 0 ? (
            <Empty>No unit is ready to release.</Empty>
          ) : (
            <ul className="divide-y divide-rule">
              {ready.map((u) => (
                <li key={u.serial}>
                  <Link to={`${paths.release}?serial=${encodeURIComponent(u.serial)}`} className={linkRow}>
                    <Badge tone="ok">Ready</Badge>
                    <span className="font-mono font-semibold">{u.serial}</span>
                    <span className="text-ink-soft">{u.familyCode}</span>
                  </Link>
                </li>
              ))}
            </ul>
          )}
        </CardBody>
      </Card>
      <Card labelledBy="blocked-heading">
        <CardHeader
          id="blocked-heading"
          title={`Blocked (${q.data ? blocked.length : '…'})`}
          description="Built units the gate stops, with its reasons."
        />
        <CardBody>
          {blocked.length === 0 ? (
            <Empty>No unit is blocked.</Empty>
          ) : (
            <ul className="divide-y divide-rule">
              {blocked.map((u) => (
                <li key={u.serial} className="py-2">
                  <Link to={`${paths.release}?serial=${encodeURIComponent(u.serial)}`} className={linkRow}>
                    <Badge tone="hold">Blocked</Badge>
                    <span className="font-mono font-semibold">{u.serial}</span>
                    <span className="text-ink-soft">
                      {u.familyCode}
                      {u.stageName ? ` · at ${u.stageName}` : ''}
                    </span>
                  </Link>
                  <ul className="ml-6 list-disc text-sm text-ink-soft">
                    {u.reasons.slice(0, 4).map((r) => (
                      <li key={r.message}>{r.message}</li>
                    ))}
                    {u.reasons.length > 4 && <li>and {plural(u.reasons.length - 4, 'more reason')}</li>}
                  </ul>
                </li>
              ))}
            </ul>
          )}
        </CardBody>
      </Card>
    </>
  );
}

/** Each role's work from live data, before the list of what it can do. */
export function LineHome({ me }: { me: SignedIn }) {
  const role = me.user.role;
  const cards: React.ReactNode[] = [];
  if (role === 'operator') cards.push(<StationQueue key="queue" />);
  if (role === 'receiving') cards.push(<TeardownQueue key="teardown" />);
  if (role === 'supervisor') cards.push(<FloorSummary key="floor" />);
  if (role === 'quality') cards.push(<NcrAges key="ages" />);
  if (role === 'shipping') cards.push(<ShippingLists key="ship" />);
  if (role === 'quality' || role === 'supervisor') cards.push(<Alerts key="alerts" />);
  if (cards.length === 0) return null;
  return (
    <section aria-label="Your work now" className="mb-8 grid grid-cols-1 items-start gap-5 xl:grid-cols-2">
      {cards}
    </section>
  );
}
