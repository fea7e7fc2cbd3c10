import { useState, type FormEvent } from 'react';
import { useNavigate, useSearchParams } from 'react-router';
import { useT } from '../lib/i18n';
import { searchHref } from '../lib/paths';

/** The one search box in the header: whatever has a number, grouped by kind on the results page. */
export function SearchBox() {
  const t = useT();
  const [params] = useSearchParams();
  const [q, setQ] = useState(params.get('q') ?? '');
  const navigate = useNavigate();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (q.trim().length >= 2) navigate(searchHref(q.trim()));
  };
  return (
    <form role="search" onSubmit={submit} className="flex items-center">
      <input
        type="search"
        aria-label={t('nav.searchLabel')}
        placeholder={t('nav.searchPlaceholder')}
        value={q}
        maxLength={60}
        onChange={(e) => setQ(e.target.value)}
        className="h-9 w-56 rounded-control border border-rule-strong bg-field px-2.5 text-ink placeholder:text-ink-faint hover:border-ink-soft xl:w-72"
      />
    </form>
  );
}
