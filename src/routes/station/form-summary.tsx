import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import type { Judged } from './readings';
import type { Problem } from './submit';
import { formatNumber, t } from '../../lib/i18n';

const MAX_LISTED = 8;

/** The notes the form shows at its top: what blocked the submit, each one a way to the box. */
export function ProblemSummary({
  title,
  problems,
  onGo,
}: {
  title: string;
  problems: Problem[];
  onGo: (key: string) => void;
}) {
  const shown = problems.slice(0, MAX_LISTED);
  return (
    <Notice tone="bad" live="alert" title={title}>
      <ul className="mt-1 flex flex-col gap-1">
        {shown.map((p) => (
          <li key={`${p.key}:${p.message}`}>
            <button
              type="button"
              onClick={() => onGo(p.key)}
              className="min-h-11 floor:min-h-12 text-left text-base underline underline-offset-4 hover:text-bad"
            >
              <span className="font-semibold">{p.label}</span>: {p.message}
            </button>
          </li>
        ))}
      </ul>
      {problems.length > shown.length && (
        <p className="mt-1">{t('form.andMore', { count: problems.length - shown.length })}</p>
      )}
    </Notice>
  );
}

/** The running count under the operator's thumb: what is still to enter, what is out of tolerance. */
export function Tally({ judged }: { judged: Judged }) {
  const missing = judged.missing.length;
  const failing = judged.failing.length;
  const unreadable = judged.unreadable.length;
  const figure = 'font-mono text-2xl font-semibold';
  return (
    <p className="flex flex-wrap items-center gap-x-5 gap-y-1 text-base">
      <span className="inline-flex items-baseline gap-1.5">
        <span className={figure}>{formatNumber(missing)}</span>{' '}
        {t('form.toEnter', { required: formatNumber(judged.required) })}
      </span>
      <span className={`inline-flex items-center gap-1.5 ${failing ? 'font-semibold text-bad' : 'text-ink-soft'}`}>
        <Icon name={failing ? 'bad' : 'ok'} size={22} />
        <span className={figure}>{formatNumber(failing)}</span> {t('form.outOfTolerance')}
      </span>
      {unreadable > 0 && (
        <span className="inline-flex items-center gap-1.5 font-semibold text-bad">
          <Icon name="alert" size={22} />
          <span className={figure}>{formatNumber(unreadable)}</span> {t('form.toCheck')}
        </span>
      )}
    </p>
  );
}
