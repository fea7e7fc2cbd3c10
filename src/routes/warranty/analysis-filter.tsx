import { useId } from 'react';
import type { AnalysisFilter } from '../../api/warranty/analysis';
import { useFamilies } from '../../api/reference/families';
import { FilterInput, FilterSelect } from '../../components/filter-fields';
import { useUrlFilter } from '../../lib/use-url-filter';

const DATE = /^\d{4}-\d{2}-\d{2}$/;

/** The fleet the analysis reads, from the address: a family and a span of ship dates. */
export function analysisFilterOf(params: URLSearchParams): AnalysisFilter {
  const family = Number(params.get('family'));
  const from = params.get('from') ?? '';
  const to = params.get('to') ?? '';
  return {
    family: Number.isInteger(family) && family > 0 ? family : undefined,
    from: DATE.test(from) ? from : undefined,
    to: DATE.test(to) ? to : undefined,
  };
}

/** Family and ship dates above both analysis screens; the address keeps them, so each view links to the other. */
export function AnalysisFilterBar() {
  const id = useId();
  const { params, setMany } = useUrlFilter();
  const families = useFamilies();
  return (
    <div className="mb-5 grid grid-cols-1 items-end gap-3 sm:grid-cols-3 lg:max-w-4xl">
      <FilterSelect
        id={`${id}-family`}
        label="Engine family"
        placeholder="Every family"
        options={(families.data ?? []).map((f) => ({ value: String(f.id), label: `${f.code} — ${f.name}` }))}
        value={params.get('family') ?? ''}
        onChange={(v) => setMany({ family: v })}
      />
      <FilterInput
        id={`${id}-from`}
        label="Shipped from"
        type="date"
        value={params.get('from') ?? ''}
        onChange={(v) => setMany({ from: v })}
      />
      <FilterInput
        id={`${id}-to`}
        label="Shipped to"
        type="date"
        value={params.get('to') ?? ''}
        onChange={(v) => setMany({ to: v })}
      />
    </div>
  );
}

/** The same filter carried to the other analysis screen. */
export const withFilter = (path: string, params: URLSearchParams) => {
  const keep = new URLSearchParams();
  for (const k of ['family', 'from', 'to']) {
    const v = params.get(k);
    if (v) keep.set(k, v);
  }
  return keep.size ? `${path}?${keep}` : path;
};
