import type { QueryClient } from '@tanstack/react-query';
import { redirect, type LoaderFunctionArgs } from 'react-router';
import { PART_KIND_LABELS, type PartKind } from '../../../shared/schemas/reference';
import type { SpecBookJson } from '../../../shared/schemas/spec';
import { specBookQueryOptions, useSpecBook } from '../../api/spec/book';
import { familiesQueryOptions, useFamilies } from '../../api/reference/families';
import { FilterSelect } from '../../components/filter-fields';
import { PageHeader } from '../../components/page-header';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { downloadCsv, toCsv } from '../../lib/csv';
import { plural } from '../../lib/format';
import { specBookHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { DemoValuesNotice } from './demo-notice';
import { ruleLimitsText, versionLabel, KIND_LABELS, shownState } from './limits';
import { StageTable } from './stage-table';

export const specBookLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'spec.read');
    const families = await queryClient.ensureQueryData(familiesQueryOptions());
    const url = new URL(request.url);
    const asked = url.searchParams.get('family');
    if (!asked) {
      // the address always names the family shown, so a copied link opens the same book
      const first = families.find((f) => f.active) ?? families[0];
      if (first) throw redirect(specBookHref(first.code, url.searchParams.get('stage') ?? undefined));
      return null;
    }
    // an unknown family is said on the page beside the choice, not as an error page
    if (families.some((f) => f.code === asked.toUpperCase())) {
      await queryClient.ensureQueryData(specBookQueryOptions(asked));
    }
    return null;
  };

type Stage = SpecBookJson['stages'][number];

/**
 * The book's stages at a glance, sticky beside them on a wide screen: how many characteristics each
 * has, which lack a rule in force, and which have a draft waiting. A long book is walked from here.
 */
function StageIndex({ stages }: { stages: Stage[] }) {
  return (
    <aside aria-labelledby="stage-index-heading" className="xl:sticky xl:top-4 xl:self-start">
      <div className="rounded-card border border-rule bg-card shadow-card">
        <h2 id="stage-index-heading" className="border-b border-rule px-4 py-3 font-semibold">
          Stages in this book
        </h2>
        <ol className="flex flex-wrap xl:block xl:divide-y xl:divide-rule">
          {stages.map((s) => {
            const noRule = s.characteristics.filter((c) => !c.inForce).length;
            const drafts = s.characteristics.filter((c) => c.draft).length;
            return (
              <li key={s.code} className="min-w-0 max-xl:basis-1/3">
                <a
                  href={`#stage-${s.code}`}
                  className="flex min-h-11 flex-col justify-center px-4 py-1.5 hover:bg-sunk floor:min-h-12"
                  onClick={(e) => {
                    // jump without touching the address, which keeps the family and stage filters
                    e.preventDefault();
                    document.getElementById(`stage-${s.code}`)?.scrollIntoView({ block: 'start' });
                  }}
                >
                  <span className="font-medium text-accent">{s.name}</span>
                  <span className="text-sm text-ink-soft">
                    {plural(s.characteristics.length, 'characteristic')}
                    {noRule > 0 && <span className="font-medium text-hold"> · {noRule} without a rule</span>}
                    {drafts > 0 && <> · {plural(drafts, 'draft')} waiting</>}
                  </span>
                </a>
              </li>
            );
          })}
        </ol>
      </div>
    </aside>
  );
}

function exportBook(book: SpecBookJson, stages: Stage[]) {
  const rows = stages.flatMap((s) => s.characteristics.map((c) => ({ stage: s, c })));
  const csv = toCsv(rows, [
    { header: 'Family', value: () => book.family.code },
    { header: 'Stage', value: (r) => r.stage.name },
    { header: 'Characteristic', value: (r) => r.c.name },
    { header: 'Critical', value: (r) => (r.c.critical ? 'yes' : 'no') },
    { header: 'Where measured', value: (r) => r.c.positionsLabel },
    { header: 'Kind', value: (r) => KIND_LABELS[r.c.kind] },
    { header: 'Limits in force', value: (r) => ruleLimitsText(r.c.inForce, r.c) },
    { header: 'Resolution', value: (r) => r.c.inForce?.resolution ?? r.c.resolution ?? '' },
    { header: 'Unit', value: (r) => r.c.inForce?.unit ?? r.c.unit ?? '' },
    { header: 'Version', value: (r) => (r.c.inForce ? versionLabel(r.c.inForce.version) : '') },
    { header: 'Status', value: (r) => (r.c.inForce ? shownState(r.c.inForce).label : '') },
    { header: 'Effective from', value: (r) => r.c.inForce?.effectiveFrom ?? '' },
    { header: 'Draft', value: (r) => (r.c.draft ? versionLabel(r.c.draft.version) : '') },
    { header: 'Scheduled', value: (r) => (r.c.scheduled ? versionLabel(r.c.scheduled.version) : '') },
  ]);
  downloadCsv(`spec-book-${book.family.code}.csv`, csv);
}

export function SpecBookPage() {
  const { params, set } = useUrlFilter();
  const families = useFamilies();
  const family = (params.get('family') ?? '').toUpperCase();
  const stage = params.get('stage') ?? '';
  const known = (families.data ?? []).some((f) => f.code === family);
  const book = useSpecBook(known ? family : null);

  const familyOptions = (families.data ?? []).map((f) => ({
    value: f.code,
    label: `${f.code} — ${f.name}${f.active ? '' : ' (retired)'}`,
  }));
  const allStages = book.data?.stages ?? [];
  const stageOptions = allStages.map((s) => ({ value: s.code, label: s.name }));
  const shown = stage ? allStages.filter((s) => s.code === stage) : allStages;
  const count = shown.reduce((n, s) => n + s.characteristics.length, 0);

  return (
    <>
      <PageHeader
        title="Spec book"
        description="The tolerance rules each station judges readings against, per engine family. Quality engineers draft and approve new versions; an approved version is never edited."
      />
      <div className="mb-5">
        <DemoValuesNotice />
      </div>
      <Card as="div">
        <form
          role="search"
          aria-label="Which spec book"
          onSubmit={(e) => e.preventDefault()}
          className="grid grid-cols-1 gap-3 px-5 py-4 md:grid-cols-[minmax(0,18rem)_minmax(0,18rem)_1fr]"
        >
          <FilterSelect
            id="spec-family"
            label="Engine family"
            placeholder="Choose a family"
            options={familyOptions}
            value={known ? family : ''}
            onChange={(v) => set('family', v)}
          />
          <FilterSelect
            id="spec-stage"
            label="Stage"
            placeholder="All stages"
            options={stageOptions}
            value={stageOptions.some((o) => o.value === stage) ? stage : ''}
            onChange={(v) => set('stage', v)}
          />
          <div className="flex flex-wrap items-end justify-between gap-3 md:justify-end">
            <p aria-live="polite" className="font-medium">
              {book.data ? `${plural(count, 'characteristic')} in ${plural(shown.length, 'stage')}` : ''}
            </p>
            <Button
              icon="download"
              disabled={!book.data || count === 0}
              onClick={() => book.data && exportBook(book.data, shown)}
            >
              Export CSV
            </Button>
          </div>
        </form>
      </Card>
      <div className="mt-5 grid grid-cols-1 gap-5 xl:grid-cols-[16rem_minmax(0,1fr)]">
        {book.data && shown.length > 1 && <StageIndex stages={shown} />}
        <div className="flex min-w-0 flex-col gap-5 xl:col-start-2">
          {family && families.data && !known && (
            <Notice tone="bad" title={`No engine family ${family}`}>
              Choose one of this plant&apos;s families above.
            </Notice>
          )}
          {book.error && (
            <Notice tone="bad" live="alert">
              {book.error.message}
            </Notice>
          )}
          {book.data && stage && shown.length === 0 && (
            <Notice tone="info" title="No characteristics at that stage">
              This family&apos;s book has nothing recorded at the stage in the address.{' '}
              <button type="button" className="font-medium text-accent underline" onClick={() => set('stage', '')}>
                Show all stages
              </button>
            </Notice>
          )}
          {book.data &&
            shown.map((s) => (
              <Card key={s.code} labelledBy={`stage-${s.code}`}>
                <CardHeader
                  id={`stage-${s.code}`}
                  title={s.name}
                  description={`${PART_KIND_LABELS[s.partKind as PartKind] ?? s.partKind} · ${plural(s.characteristics.length, 'characteristic')}`}
                />
                <CardBody flush>
                  <StageTable family={book.data.family.code} stage={s} />
                </CardBody>
              </Card>
            ))}
          {book.data && allStages.length === 0 && (
            <Card as="div">
              <CardBody>
                <p className="flex items-center gap-2 text-ink-soft">
                  <Icon name="info" /> No stage of this family has characteristics yet.
                </p>
              </CardBody>
            </Card>
          )}
        </div>
      </div>
    </>
  );
}
