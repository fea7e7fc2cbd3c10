import { useIssueDocuments, useUnitDocuments } from '../../api/release/documents';
import { Button, buttonClass } from '../../components/ui/button';
import { Notice } from '../../components/ui/notice';
import { documentHref } from '../../lib/paths';

/**
 * The papers that go with a released unit, drawn from the data logged at release: each on A4 or
 * Letter. A release whose documents were not issued (the server lost its database in between)
 * offers to issue them; they are the same documents whenever they are printed.
 */
export function ReleaseDocuments({ serial, canIssue }: { serial: string; canIssue: boolean }) {
  const docs = useUnitDocuments(serial);
  const issue = useIssueDocuments();
  if (docs.error) return <Notice tone="bad">{docs.error.message}</Notice>;
  if (!docs.data) return <p className="text-sm text-ink-soft">Loading its documents…</p>;
  if (!docs.data.documents.length) {
    return (
      <Notice tone="hold" title="Documents not issued yet">
        The build record, certificate of conformance and packing slip were not issued with this release.
        {canIssue && (
          <span className="mt-2 block">
            <Button type="button" onClick={() => issue.mutate(serial)} disabled={issue.isPending}>
              Issue them now
            </Button>
          </span>
        )}
        {issue.error && <span className="mt-2 block">{issue.error.message}</span>}
      </Notice>
    );
  }
  return (
    <div className="flex flex-col gap-2">
      <p className="text-sm font-semibold uppercase tracking-wide text-ink-soft">Documents</p>
      <ul className="flex flex-col gap-2">
        {docs.data.documents.map((d) => (
          <li key={d.kind} className="flex flex-wrap items-center gap-2">
            <span className="min-w-[14rem]">
              {d.title} <span className="font-mono text-sm text-ink-soft">{d.documentNumber}</span>
            </span>
            {(['a4', 'letter'] as const).map((paper) => (
              <a
                key={paper}
                href={documentHref(serial, d.kind, paper)}
                target="_blank"
                rel="noopener"
                className={buttonClass('secondary', 'sm')}
              >
                {paper === 'a4' ? 'A4' : 'Letter'} (PDF)
              </a>
            ))}
          </li>
        ))}
      </ul>
    </div>
  );
}
