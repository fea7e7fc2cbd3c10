import type { QueryClient } from '@tanstack/react-query';
import { Link, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import { searchQueryOptions, useSearch } from '../../api/line/line';
import { DataAge } from '../../components/data-age';
import { PageHeader } from '../../components/page-header';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { requireSignedIn } from '../../lib/session';

export const searchLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireSignedIn(queryClient, request);
    const q = new URL(request.url).searchParams.get('q')?.trim() ?? '';
    if (q.length >= 2) await queryClient.ensureQueryData(searchQueryOptions(q)).catch(() => null);
    return null;
  };

export function SearchPage() {
  const [params] = useSearchParams();
  const q = params.get('q')?.trim() ?? '';
  const found = useSearch(q);
  const groups = found.data?.groups ?? [];
  return (
    <>
      <PageHeader
        title="Search"
        description="Part of a serial, a lot code, a customer’s reference, an NCR number or a casting number, in any case."
      />
      {found.data && (
        <div className="mb-3">
          <DataAge readFrom={found.data.readFrom} />
        </div>
      )}
      {q.length < 2 ? (
        <Notice>Type at least two characters in the search box above.</Notice>
      ) : found.error ? (
        <Notice tone="bad">{found.error.message}</Notice>
      ) : found.data && groups.length === 0 ? (
        <Notice>Nothing matches “{q}”.</Notice>
      ) : (
        <div className="grid grid-cols-1 gap-5 xl:grid-cols-2">
          {groups.map((g) => (
            <Card key={g.kind} labelledBy={`found-${g.kind}`}>
              <CardHeader
                id={`found-${g.kind}`}
                title={`${g.label} (${g.hits.length}${g.more ? '+' : ''})`}
                description={g.more ? 'The first few; type more of it to narrow the list.' : undefined}
              />
              <CardBody>
                <ul className="divide-y divide-rule">
                  {g.hits.map((h) => (
                    <li key={h.link + h.title}>
                      <Link
                        to={h.link}
                        className="flex min-h-11 floor:min-h-12 flex-wrap items-center gap-x-3 py-1.5 text-accent underline-offset-4 hover:underline"
                      >
                        <span className="font-mono font-semibold">{h.title}</span>
                        <span className="text-ink-soft">{h.detail}</span>
                      </Link>
                    </li>
                  ))}
                </ul>
              </CardBody>
            </Card>
          ))}
        </div>
      )}
    </>
  );
}
