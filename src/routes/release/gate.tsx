import { Link } from 'react-router';
import type { BlockingReason, ReleaseCheckJson } from '../../../shared/schemas/release';
import { Icon, type IconName } from '../../components/ui/icon';
import { plural } from '../../lib/format';

/** "Open NCR-26-0004", "Open BK-7KX4-P2MK": what a server link leads to, from its last part. */
export function linkWords(link: string): string {
  const last = decodeURIComponent(link.split('/').filter(Boolean).pop() ?? '');
  return last ? `Open ${last}` : 'Open';
}

const REASON_MARK: Record<BlockingReason['code'], IconName> = {
  stage_missing: 'wait',
  stage_failed: 'bad',
  run_test: 'bad',
  ncr_open: 'hold',
  lot_ncr_open: 'hold',
  not_finished: 'wait',
  shipped: 'info',
  returned: 'hold',
  part_scrapped: 'bad',
  part_on_hold: 'hold',
  lot_unusable: 'bad',
};

/** The gate's answer across the width, in words first. */
export function GateVerdict({ check }: { check: ReleaseCheckJson }) {
  const ok = check.releasable;
  return (
    <div
      role="status"
      className={`flex items-center gap-3 rounded-card px-5 py-4 ${ok ? 'border-2 border-ok bg-ok-tint text-ok' : 'border-[3px] border-double border-bad bg-bad-tint text-bad'}`}
    >
      <Icon name={ok ? 'ok' : 'bad'} size={34} />
      <div>
        <p className="text-2xl font-semibold leading-tight">{ok ? 'Ready to ship' : 'Not ready to ship'}</p>
        <p className="text-ink">
          {ok
            ? `${check.serial} passes every check of the release gate.`
            : `${check.serial}: ${plural(check.reasons.length, 'thing')} to clear first.`}
        </p>
      </div>
    </div>
  );
}

/** Every check that was made, met or not, each with its word and its mark. */
export function GateChecklist({ check }: { check: ReleaseCheckJson }) {
  return (
    <ul aria-label="Release gate checks" className="flex flex-col divide-y divide-rule">
      {check.checks.map((c) => (
        <li key={c.label} className="flex flex-wrap items-center gap-x-3 gap-y-1 py-2.5">
          <span
            className={`inline-flex w-28 shrink-0 items-center gap-1.5 font-semibold ${c.ok ? 'text-ok' : 'text-bad'}`}
          >
            <Icon name={c.ok ? 'ok' : 'bad'} size={22} />
            {c.ok ? 'Met' : 'Not met'}
            <span className="sr-only">:</span>
          </span>
          <span className="min-w-0 flex-1">{c.label}</span>
          {c.link && (
            <Link
              to={c.link}
              className="inline-flex min-h-11 floor:min-h-12 items-center font-medium text-accent underline underline-offset-4"
            >
              {linkWords(c.link)}
            </Link>
          )}
        </li>
      ))}
    </ul>
  );
}

/** Each reason it cannot ship yet, in the server's words, with where to go to clear it. */
export function GateReasons({ reasons }: { reasons: BlockingReason[] }) {
  if (!reasons.length) return null;
  return (
    <section aria-labelledby="reasons-heading" className="flex flex-col gap-2">
      <h3 id="reasons-heading" className="text-lg font-semibold">
        What keeps it from shipping ({reasons.length})
      </h3>
      <ol className="flex flex-col gap-2">
        {reasons.map((r, i) => (
          <li
            key={`${r.code}/${r.link}/${i}`}
            className="flex flex-wrap items-center gap-x-3 gap-y-1 rounded-control border border-rule-strong bg-card px-3 py-2"
          >
            <Icon name={REASON_MARK[r.code]} size={22} className="shrink-0 text-ink-soft" />
            <span className="min-w-0 flex-1">{r.message}</span>
            <Link
              to={r.link}
              className="inline-flex min-h-11 floor:min-h-12 items-center font-medium text-accent underline underline-offset-4"
            >
              {linkWords(r.link)}
            </Link>
          </li>
        ))}
      </ol>
    </section>
  );
}
