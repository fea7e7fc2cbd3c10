import type { SelectHTMLAttributes } from 'react';
import { Icon } from './icon';
import { controlClass } from './input';

export type Option = { value: string; label: string };
export type OptionGroup = { label: string; options: Option[] };

type SelectProps = SelectHTMLAttributes<HTMLSelectElement> & {
  options?: Option[];
  groups?: OptionGroup[];
  /** A first, empty choice such as "All roles" or "No stage". */
  placeholder?: string;
};

export function Select({ options = [], groups = [], placeholder, ...rest }: SelectProps) {
  return (
    <span className="relative block">
      <select className={`${controlClass} h-9 appearance-none pr-8 floor:h-12`} {...rest}>
        {placeholder !== undefined && <option value="">{placeholder}</option>}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
        {groups.map((g) => (
          <optgroup key={g.label} label={g.label}>
            {g.options.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </optgroup>
        ))}
      </select>
      <span className="pointer-events-none absolute inset-y-0 right-2 flex items-center text-ink-soft">
        <Icon name="chevronDown" size={16} />
      </span>
    </span>
  );
}
