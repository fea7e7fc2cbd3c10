import { useEffect, useRef } from 'react';
import type { ReadingJson, ResultJson } from '../../api/station/types';
import { Icon } from '../../components/ui/icon';
import { formatMoment, t, useT } from '../../lib/i18n';
import { NcrNumber } from './ncr-number';
import { formatValue } from './numbers';
import { positionLabel } from '../../lib/position-words';

/** A reading's value as it was judged: the rounded figure, or the check's outcome. */
function valueOf(r: ReadingJson, resolution: number | null) {
  if (r.kind === 'attribute') return r.passed ? t('verdict.pass') : t('verdict.fail');
  const v = r.rounded ?? r.value;
  if (v === null) return '—';
  return `${formatValue(v, resolution)}${r.unit ? ` ${r.unit}` : ''}`;
}

function limitOf(r: ReadingJson, resolution: number | null) {
  if (r.kind === 'attribute') return t('verdict.pass');
  const u = r.unit ? ` ${r.unit}` : '';
  const f = (v: number) => formatValue(v, resolution);
  if (r.lower !== null && r.upper !== null) return `${f(r.lower)}–${f(r.upper)}${u}`;
  if (r.lower !== null) return `≥ ${f(r.lower)}${u}`;
  if (r.upper !== null) return `≤ ${f(r.upper)}${u}`;
  return '—';
}

/** Decimals for a failing reading: those of its limits, so the value and the limit line up. */
function resolutionOf(r: ReadingJson): number | null {
  const figures = [r.lower, r.upper, r.rounded].filter((x): x is number => x !== null);
  const d = Math.max(0, ...figures.map((x) => (String(x).split('.')[1] ?? '').length));
  return d ? 10 ** -d : 1;
}

/** The reply, with the characteristics this tablet sent as read with another gauge than the result's. */
export type RecordedResult = ResultJson & { otherGauges?: { name: string; gauge: string }[] };

type VerdictPanelProps = { result: RecordedResult; onNext: () => void; canReadNcr: boolean };

/** The answer, filling the width, plain words first: passed or failed, and where the part goes now. */
export function VerdictPanel({ result, onNext, canReadNcr }: VerdictPanelProps) {
  const headingRef = useRef<HTMLHeadingElement>(null);
  const t = useT();
  const passed = result.verdict === 'pass';
  const held = result.item.status === 'on_hold';
  const next = held
    ? t('verdict.onHold')
    : result.item.currentStage
      ? t('verdict.nextStage', { stage: result.item.currentStage.name })
      : result.item.status === 'finished'
        ? t('verdict.routeFinished')
        : t('verdict.noFurtherStage');

  useEffect(() => {
    headingRef.current?.focus();
  }, []);

  return (
    <section
      role="status"
      aria-labelledby="verdict-heading"
      className={`overflow-hidden rounded-card border-4 bg-card shadow-card ${passed ? 'border-ok' : 'border-bad'}`}
    >
      <div
        className={`flex flex-wrap items-center gap-x-6 gap-y-2 px-6 py-5 text-white ${passed ? 'bg-ok' : 'bg-bad'}`}
      >
        <Icon name={passed ? 'ok' : 'bad'} size={64} strokeWidth={2.25} />
        <h2
          id="verdict-heading"
          ref={headingRef}
          tabIndex={-1}
          className="text-[3.5rem] leading-none font-bold tracking-tight outline-none"
        >
          {passed ? t('verdict.passed') : t('verdict.failed')}
        </h2>
        <p className="text-xl">
          {result.stage.name}
          <span className="sr-only">,</span>
          <span className="block font-mono text-3xl font-semibold tracking-wide">{result.serial}</span>
        </p>
      </div>
      <div className="flex flex-col gap-5 px-6 py-5">
        <p className={`flex flex-wrap items-center gap-2 text-2xl font-semibold ${held ? 'text-hold' : 'text-ink'}`}>
          <Icon name={held ? 'hold' : 'arrowRight'} size={28} />
          {next}
        </p>
        {result.nonconformance && (
          <p className="text-xl">
            NCR <NcrNumber number={result.nonconformance.number} link={canReadNcr} />{' '}
            {t('verdict.ncrRaised', { severity: t(`severity.${result.nonconformance.severity}`) })}
          </p>
        )}
        {result.failing.length > 0 && (
          <div>
            <h3 className="mb-2 text-xl font-semibold">
              {t('verdict.outOfTolerance', { count: result.failing.length })}
            </h3>
            <div className="overflow-x-auto">
              <table className="w-full min-w-[34rem] text-left text-lg">
                <thead className="border-b-2 border-ink text-base text-ink-soft">
                  <tr>
                    <th className="py-2 pr-4 font-semibold">{t('verdict.characteristic')}</th>
                    <th className="py-2 pr-4 font-semibold">{t('verdict.where')}</th>
                    <th className="py-2 pr-4 text-right font-semibold">{t('verdict.reading')}</th>
                    <th className="py-2 text-right font-semibold">{t('verdict.limits')}</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-rule">
                  {result.failing.map((r) => {
                    const res = resolutionOf(r);
                    return (
                      <tr key={`${r.characteristic}@${r.position}`}>
                        <td className="py-2 pr-4 font-medium">{r.name}</td>
                        <td className="py-2 pr-4">
                          {positionLabel(r.position, r.positionLabel)}
                          {r.location && <span className="block text-base text-ink-soft">{r.location}</span>}
                        </td>
                        <td className="whitespace-nowrap py-2 pr-4 text-right font-mono font-semibold text-bad">
                          <span className="inline-flex items-center gap-1.5">
                            <Icon name="bad" size={18} />
                            {valueOf(r, res)}
                          </span>
                        </td>
                        <td className="whitespace-nowrap py-2 text-right font-mono">{limitOf(r, res)}</td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          </div>
        )}
        <p className="text-base text-ink-soft">
          {t('verdict.recorded', { when: formatMoment(result.finishedAt), who: result.operator })}
          {result.gauge ? ` ${t('verdict.withGauge', { gauge: result.gauge })}` : ''}
          {result.otherGauges?.length
            ? ` (${result.otherGauges.map((g) => `${g.name} ${t('verdict.withGauge', { gauge: g.gauge })}`).join('; ')})`
            : ''}
          .
        </p>
        <div>
          <button
            type="button"
            onClick={onNext}
            className="inline-flex h-16 min-w-56 items-center justify-center gap-2 rounded-control border border-accent-strong bg-accent px-8 text-2xl font-semibold text-white hover:bg-accent-strong"
          >
            <Icon name="scan" size={26} />
            {t('verdict.nextPart')}
          </button>
        </div>
      </div>
    </section>
  );
}
