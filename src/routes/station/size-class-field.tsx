import { useFormContext } from 'react-hook-form';
import type { FormCharacteristic } from '../../../shared/domain/evaluate';
import { Icon } from '../../components/ui/icon';
import { t } from '../../lib/i18n';
import { bigControl } from './controls';
import { formatValue } from './numbers';
import type { Problem } from './submit';

/** The form's characteristics with each chosen size class's limits in place of the rule's own. */
export function withSizeClasses(chars: FormCharacteristic[], chosen: Record<string, string>): FormCharacteristic[] {
  return chars.map((c) => {
    const k = c.sizeClasses?.find((x) => x.code === chosen[c.code]);
    if (!k || !c.rule) return c;
    return {
      ...c,
      rule: {
        ...c.rule,
        limitType: 'range',
        nominal: null,
        minusTol: null,
        plusTol: null,
        lowerLimit: k.lower,
        upperLimit: k.upper,
      },
    };
  });
}

/** The size classes chosen, as the server takes them: only those chosen. */
export const sizeClassesToSend = (chosen: Record<string, string> | undefined) =>
  Object.fromEntries(Object.entries(chosen ?? {}).filter(([, v]) => v));

export const sizeClassKey = (c: FormCharacteristic) => `sizeClasses.${c.code}`;

/**
 * A measured characteristic with size classes needs one chosen before it is sent, as the server
 * requires: the build matches pistons and bearings to it.
 */
export function sizeClassProblems(
  measured: FormCharacteristic[],
  chosen: Record<string, string> | undefined,
  entered: (c: FormCharacteristic) => boolean,
): Problem[] {
  return measured
    .filter((c) => c.sizeClasses?.length && !chosen?.[c.code] && entered(c))
    .map((c) => ({
      key: sizeClassKey(c),
      label: t('form.sizeClassFor', { name: c.name }),
      message: t('form.sizeClassMissing'),
    }));
}

/**
 * Which size the part was finished to (the bore's oversize, the journal's undersize): the readings
 * are judged to that class's limits and the build matches pistons or bearings to it.
 */
export function SizeClassField({
  char,
  problem,
  onChange,
}: {
  char: FormCharacteristic;
  problem?: string;
  onChange: () => void;
}) {
  const { register } = useFormContext<{ sizeClasses: Record<string, string> }>();
  if (!char.sizeClasses?.length) return null;
  const id = `size-class-${char.code}`;
  const unit = char.unit ?? '';
  const number = (n: number) => formatValue(n, char.rule?.resolution);
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-base font-semibold text-ink">
        {t('form.sizeClass')}
      </label>
      <select
        id={id}
        data-key={sizeClassKey(char)}
        aria-invalid={problem ? true : undefined}
        {...register(`sizeClasses.${char.code}`, { onChange })}
        aria-label={t('form.sizeClassFor', { name: char.name })}
        className={`${bigControl} min-h-11`}
      >
        <option value="">{t('form.chooseSizeClass')}</option>
        {char.sizeClasses.map((k) => (
          <option key={k.code} value={k.code}>
            {t('form.sizeClassOption', {
              name: k.name,
              code: k.code,
              lower: number(k.lower),
              upper: number(k.upper),
              unit,
            })}
          </option>
        ))}
      </select>
      {problem && (
        <p className="flex items-start gap-1.5 text-base font-semibold text-bad">
          <Icon name="bad" size={18} className="mt-0.5 shrink-0" />
          {problem}
        </p>
      )}
    </div>
  );
}
