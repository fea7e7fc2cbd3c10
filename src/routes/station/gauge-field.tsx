import { useId } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import type { GaugeChoice } from '../../api/station/types';
import { Icon } from '../../components/ui/icon';
import { bigControl, bigLabel } from './controls';
import { t } from '../../lib/i18n';

type GaugeFieldProps = {
  gauges: GaugeChoice[];
  /** The unit of the readings the gauge is chosen for. */
  unit: string | null;
  /** The first measured characteristic: only gauges that can measure it are offered. */
  first: string | null;
  problem?: string;
  onChange: () => void;
};

const optionText = (g: GaugeChoice) =>
  `${g.code} — ${g.description}${g.usable ? '' : ` (cannot be used: ${g.why.replace(/\.$/, '')})`}${g.studyFailed ? ' — last gauge study failed' : ''}`;

/** Which gauge took the readings: a gauge past its calibration date is listed, greyed, with the reason. */
export function GaugeField({ gauges, unit, first, problem, onChange }: GaugeFieldProps) {
  const id = useId();
  const { register } = useFormContext<{ gauge: string }>();
  const chosen = useWatch<{ gauge: string }, 'gauge'>({ name: 'gauge' });
  const g = gauges.find((x) => x.code === chosen);
  // a gauge that cannot measure it (unit, range, resolution) is not offered at all
  const matching = gauges.filter((x) => first !== null && !x.unfit[first]);
  const others: GaugeChoice[] = [];
  const unusable = gauges.filter((x) => !x.usable && matching.includes(x));
  return (
    <div className="flex flex-col gap-1.5">
      <label htmlFor={id} className={bigLabel}>
        {t('form.gaugeUsed')}
      </label>
      <span className="relative block max-w-2xl">
        <select
          id={id}
          data-field=""
          data-key="gauge"
          aria-invalid={problem ? true : undefined}
          aria-describedby={`${id}-hint`}
          className={`${bigControl} h-14 appearance-none pr-10`}
          {...register('gauge', { onChange })}
        >
          <option value="">{t('form.chooseGauge')}</option>
          {matching.length > 0 && (
            <optgroup label={t('form.gaugesThatFit', { unit: unit ?? '—' })}>
              {matching.map((x) => (
                <option key={x.code} value={x.code} disabled={!x.usable}>
                  {optionText(x)}
                </option>
              ))}
            </optgroup>
          )}
          <optgroup label={matching.length ? t('form.otherGauges') : t('form.gauges')}>
            {others.map((x) => (
              <option key={x.code} value={x.code} disabled={!x.usable}>
                {optionText(x)}
              </option>
            ))}
          </optgroup>
        </select>
        <span className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-ink-soft">
          <Icon name="chevronDown" size={20} />
        </span>
      </span>
      <div id={`${id}-hint`} className="flex flex-col gap-1 text-base">
        {problem ? (
          <p className="flex items-start gap-1.5 font-semibold text-bad">
            <Icon name="bad" size={18} className="mt-0.5 shrink-0" />
            {problem}
          </p>
        ) : g ? (
          <p className="flex items-start gap-1.5 text-ok">
            <Icon name="ok" size={18} className="mt-0.5 shrink-0" />
            {g.why}
          </p>
        ) : null}
        {g?.studyFailed && (
          <p className="flex items-start gap-1.5 font-semibold text-hold">
            <Icon name="hold" size={18} className="mt-0.5 shrink-0" />
            {t('gauge.studyFailed')}
          </p>
        )}
        {unusable.length > 0 && (
          <p className="flex items-start gap-1.5 text-ink-soft">
            <Icon name="off" size={18} className="mt-0.5 shrink-0" />
            {t('gauge.notUsable', {
              list: unusable.map((x) => `${x.code} (${x.why.replace(/\.$/, '')})`).join('; '),
            })}
          </p>
        )}
      </div>
    </div>
  );
}

/** A usable gauge that can measure the form's first measured characteristic, if there is one. */
export function preselectedGauge(gauges: GaugeChoice[], first: string | null): string {
  return gauges.find((g) => g.usable && first !== null && !g.unfit[first] && !g.studyFailed)?.code ?? '';
}
