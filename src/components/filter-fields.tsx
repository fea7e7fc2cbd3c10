import { useState } from 'react';
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

/** A date the filter can use: empty (no filter), or a whole date from 1900 on. */
const usableDate = (v: string) => v === '' || (/^\d{4}-\d{2}-\d{2}$/.test(v) && Number(v.slice(0, 4)) >= 1900);

/**
 * A labelled free-text or date filter above a table. A date box keeps what is being typed to
 * itself and passes it on only once it is a usable date (or the box is left), so typing the year
 * a digit at a time is not undone by the list re-rendering under it.
 */
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
  const [draft, setDraft] = useState(value);
  const [seen, setSeen] = useState(value);
  if (value !== seen) {
    // the address changed (our own commit, Clear filters, the back button): follow it
    setSeen(value);
    setDraft(value);
  }
  if (type !== 'date') {
    return (
      <Field id={id} label={label}>
        <Input id={id} type={type} placeholder={placeholder} value={value} onChange={(e) => onChange(e.target.value)} />
      </Field>
    );
  }
  return (
    <Field id={id} label={label}>
      <Input
        id={id}
        type="date"
        placeholder={placeholder}
        value={draft}
        onChange={(e) => {
          const v = e.target.value;
          setDraft(v);
          if (usableDate(v) && v !== value) onChange(v);
        }}
        onBlur={() => {
          if (draft !== value) onChange(draft);
        }}
      />
    </Field>
  );
}
