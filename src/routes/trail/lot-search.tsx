import { useId, useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router';
import { Button } from '../../components/ui/button';
import { describedBy, Field } from '../../components/ui/field';
import { Input } from '../../components/ui/input';
import { lotHref } from '../../lib/paths';

/** A purchased lot by its code: every unit it went into (a supplier's recall starts here). */
export function LotSearch({ initial = '' }: { initial?: string }) {
  const id = useId();
  const navigate = useNavigate();
  const [code, setCode] = useState(initial);
  const [error, setError] = useState<string | null>(null);
  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    const lot = code.trim();
    if (!lot) {
      setError('Enter a lot code.');
      return;
    }
    void navigate(lotHref(lot.toUpperCase()));
  };
  const hint = 'As printed on the supplier’s box label.';
  return (
    <form role="search" aria-label="Find a lot" onSubmit={onSubmit} noValidate className="flex flex-col gap-2">
      <Field id={id} label="Lot code" hint={hint} error={error ?? undefined}>
        <div className="flex flex-wrap gap-2">
          <div className="min-w-0 flex-1 basis-48">
            <Input
              id={id}
              mono
              value={code}
              onChange={(e) => {
                setCode(e.target.value);
                setError(null);
              }}
              autoComplete="off"
              spellCheck={false}
              aria-invalid={error ? true : undefined}
              aria-describedby={describedBy(id, hint, error)}
            />
          </div>
          <Button type="submit">Find lot</Button>
        </div>
      </Field>
    </form>
  );
}
