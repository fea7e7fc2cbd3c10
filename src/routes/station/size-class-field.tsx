import { useFormContext } from 'react-hook-form';
import type { FormCharacteristic } from '../../../shared/domain/evaluate';
import { bigControl } from './controls';

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

/**
 * Which size the part was finished to (the bore's oversize, the journal's undersize): the readings
 * are judged to that class's limits and the build matches pistons or bearings to it.
 */
export function SizeClassField({ char }: { char: FormCharacteristic }) {
  const { register } = useFormContext<{ sizeClasses: Record<string, string> }>();
  if (!char.sizeClasses?.length) return null;
  const id = `size-class-${char.code}`;
  const unit = char.unit ?? '';
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-base font-semibold text-ink">
        Size class finished to
      </label>
      <select
        id={id}
        {...register(`sizeClasses.${char.code}`)}
        aria-label={`${char.name}: size class finished to`}
        className={`${bigControl} min-h-11`}
      >
        <option value="">Not chosen: judged to the rule’s own limits</option>
        {char.sizeClasses.map((k) => (
          <option key={k.code} value={k.code}>
            {k.name} ({k.code}): {k.lower} to {k.upper} {unit}
          </option>
        ))}
      </select>
    </div>
  );
}
