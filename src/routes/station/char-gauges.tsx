import { useFormContext, useWatch } from 'react-hook-form';
import type { FormCharacteristic, GaugeChoice } from '../../api/station/types';
import { Icon } from '../../components/ui/icon';
import { bigControl } from './controls';
import type { Draft, Problem } from './submit';
import { t } from '../../lib/i18n';

/**
 * A measured characteristic can be read with another gauge than the result's (the finish with a
 * profilometer, journals with a micrometer). The form keeps one choice per measured characteristic,
 * in form order; '' means "the same as Gauge used".
 */
export const measuredOf = (characteristics: FormCharacteristic[]) =>
  characteristics.filter((c) => c.kind === 'variable');

export const charGaugeKey = (c: FormCharacteristic) => `gauges.${c.code}`;

/** Whether the main gauge can measure it (unit, range, resolution, as the server judges). */
const mainFits = (gauges: GaugeChoice[], main: string, c: FormCharacteristic) => {
  const g = gauges.find((x) => x.code === main);
  return !!g && !g.unfit[c.code];
};

/** Only the usable gauges that can measure this characteristic are offered for it. */
const usableFor = (gauges: GaugeChoice[], c: FormCharacteristic) => gauges.filter((g) => g.usable && !g.unfit[c.code]);

/** Worth asking only where the main gauge cannot have read it, or where the operator had a real choice. */
export function asksGauge(c: FormCharacteristic, gauges: GaugeChoice[], main: string): boolean {
  return !mainFits(gauges, main, c) || usableFor(gauges, c).length > 1;
}

/** A gauge that can measure it when the main gauge cannot; otherwise "same". */
export function preselectedFor(c: FormCharacteristic, gauges: GaugeChoice[], main: string): string {
  if (mainFits(gauges, main, c)) return '';
  return usableFor(gauges, c)[0]?.code ?? '';
}

/** The choices as the form starts, for the preselected main gauge. */
export const startingChoices = (measured: FormCharacteristic[], gauges: GaugeChoice[], main: string) =>
  measured.map((c) => (asksGauge(c, gauges, main) ? preselectedFor(c, gauges, main) : ''));

/** After the main gauge changes: a characteristic left on "same" that the new gauge cannot read gets its own. */
export function choicesAfterMainChange(
  measured: FormCharacteristic[],
  gauges: GaugeChoice[],
  main: string,
  choices: string[],
): string[] {
  return measured.map((c, i) => {
    const now = choices[i] ?? '';
    return now === '' && asksGauge(c, gauges, main) ? preselectedFor(c, gauges, main) : now;
  });
}

/** The characteristics read with another gauge than the main one, as the server takes them. */
export function gaugesToSend(
  measured: FormCharacteristic[],
  gauges: GaugeChoice[],
  main: string,
  choices: string[],
): Record<string, string> {
  const out: Record<string, string> = {};
  measured.forEach((c, i) => {
    const g = choices[i] ?? '';
    if (g && g !== main && asksGauge(c, gauges, main)) out[c.code] = g;
  });
  return out;
}

export function charGaugeProblems(measured: FormCharacteristic[], gauges: GaugeChoice[], draft: Draft): Problem[] {
  const sent = gaugesToSend(measured, gauges, draft.gauge, draft.gauges);
  return measured.flatMap((c) => {
    const code = sent[c.code];
    if (!code) return [];
    const g = gauges.find((x) => x.code === code);
    if (g?.usable && !g.unfit[c.code]) return [];
    const why = g && !g.usable ? g.why : (g?.unfit[c.code] ?? 'choose a gauge from the list');
    return [{ key: charGaugeKey(c), label: `Gauge for ${c.name}`, message: why }];
  });
}

type CharGaugeFieldProps = {
  char: FormCharacteristic;
  index: number;
  gauges: GaugeChoice[];
  problem?: string;
  onChange: () => void;
};

/** The compact choice in a characteristic's header: which gauge read this one, if not the main gauge. */
export function CharGaugeField({ char, index, gauges, problem, onChange }: CharGaugeFieldProps) {
  const { register } = useFormContext<Draft>();
  const main = useWatch<Draft, 'gauge'>({ name: 'gauge' });
  if (!asksGauge(char, gauges, main)) return null;
  const matching = usableFor(gauges, char);
  const others: GaugeChoice[] = [];
  const name = t('form.gaugeFor', { name: char.name });
  return (
    <div className="flex flex-col gap-1">
      <div className="flex flex-wrap items-center gap-2">
        <span aria-hidden="true" className="text-base font-semibold text-ink-soft">
          {t('form.gauge')}
        </span>
        <span className="relative block">
          <select
            aria-label={name}
            aria-invalid={problem ? true : undefined}
            data-key={charGaugeKey(char)}
            className={`${bigControl} h-11 floor:h-12 w-auto max-w-[22rem] appearance-none py-0 pr-9`}
            {...register(`gauges.${index}`, { onChange })}
          >
            <option value="">{t('form.sameGauge')}</option>
            {matching.length > 0 && (
              <optgroup label={t('form.gaugesThatFitShort')}>
                {matching.map((g) => (
                  <option key={g.code} value={g.code}>
                    {g.code} — {g.description}
                  </option>
                ))}
              </optgroup>
            )}
            {others.length > 0 && (
              <optgroup label={matching.length ? t('form.otherGauges') : t('form.gauges')}>
                {others.map((g) => (
                  <option key={g.code} value={g.code}>
                    {g.code} — {g.description}
                  </option>
                ))}
              </optgroup>
            )}
          </select>
          <span className="pointer-events-none absolute inset-y-0 right-2.5 flex items-center text-ink-soft">
            <Icon name="chevronDown" size={18} />
          </span>
        </span>
      </div>
      {problem && (
        <p className="flex items-start gap-1.5 text-base font-semibold text-bad">
          <Icon name="bad" size={18} className="mt-0.5 shrink-0" />
          {problem}
        </p>
      )}
    </div>
  );
}
