import { Field } from './ui/field';
import { Input } from './ui/input';
import { Select, type Option } from './ui/select';

/** A labelled choice above a table; the empty choice (placeholder) means "no filter". */
export function FilterSelect({
  id,
  label,
  placeholder,
  options,
  value,
  onChange,
}: {
  id: string;
  label: string;
  placeholder: string;
  options: Option[];
  value: string;
  onChange: (value: string) => void;
}) {
  return (
    <Field id={id} label={label}>
      <Select
        id={id}
        placeholder={placeholder}
        options={options}
        value={value}
        onChange={(e) => onChange(e.target.value)}
      />
    </Field>
  );
}

/** A labelled free-text or date filter above a table. */
export function FilterInput({
  id,
  label,
  value,
  onChange,
  type = 'search',
  placeholder,
}: {
  id: string;
  label: string;
  value: string;
  onChange: (value: string) => void;
  type?: 'search' | 'date' | 'text';
  placeholder?: string;
}) {
  return (
    <Field id={id} label={label}>
      <Input id={id} type={type} placeholder={placeholder} value={value} onChange={(e) => onChange(e.target.value)} />
    </Field>
  );
}
