import type { QueryClient } from '@tanstack/react-query';
import { useState, type ChangeEvent } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import type { ImportPlan, ProcessImportJson } from '../../../../shared/schemas/process-document';
import { useSignedIn, type SignedIn } from '../../../api/auth/me';
import {
  checkProcessDocument,
  fetchProcessDocument,
  importsQueryOptions,
  useApproveImport,
  useDiscardImport,
  useDraftImport,
  useImports,
  type DocumentCheckJson,
} from '../../../api/process/imports';
import { PageHeader } from '../../../components/page-header';
import { Badge, type Tone } from '../../../components/ui/badge';
import { Button, ButtonLink } from '../../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../../components/ui/card';
import { Field } from '../../../components/ui/field';
import { Textarea } from '../../../components/ui/input';
import { Notice } from '../../../components/ui/notice';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../../components/ui/table';
import { formatWhen, plural } from '../../../lib/format';
import { ApiError } from '../../../lib/http';
import { paths } from '../../../lib/paths';
import { requirePermission } from '../../../lib/session';
import { DocumentProblems, type Problem } from './document-problems';
import { SignChange } from './sign-change';

export const documentLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'process.edit');
    await queryClient.ensureQueryData(importsQueryOptions());
    return null;
  };

const STATUS: Record<ProcessImportJson['status'], { label: string; tone: Tone }> = {
  draft: { label: 'Draft', tone: 'wait' },
  approved: { label: 'Approved', tone: 'ok' },
  discarded: { label: 'Discarded', tone: 'off' },
};

function downloadJson(filename: string, body: unknown) {
  const url = URL.createObjectURL(new Blob([JSON.stringify(body, null, 2)], { type: 'application/json' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

const SIGN_FIELDS = new Set(['reason', 'password', 'effectiveFrom']);

const problemsOf = (err: ApiError): Problem[] =>
  Object.entries(err.fields).map(([path, message]) => ({ path, message }));

function DownloadCard() {
  const [state, setState] = useState<{ busy: boolean; error: string | null; done: string | null }>({
    busy: false,
    error: null,
    done: null,
  });
  const onDownload = async () => {
    setState({ busy: true, error: null, done: null });
    try {
      const doc = await fetchProcessDocument();
      const name = `coretrail-process-${new Date().toISOString().slice(0, 10)}.json`;
      downloadJson(name, doc);
      setState({ busy: false, error: null, done: name });
    } catch (err) {
      setState({ busy: false, error: err instanceof Error ? err.message : String(err), done: null });
    }
  };
  return (
    <Card labelledBy="download-heading">
      <CardHeader
        id="download-heading"
        title="Download the process document"
        description="Part kinds, engine families, stages, characteristics, the routes in force and the casting numbers each family accepts, as one JSON file. Retired ones are left out; tolerance limits stay in the spec book."
        actions={
          <Button variant="primary" icon="download" onClick={onDownload} disabled={state.busy} aria-busy={state.busy}>
            Download JSON
          </Button>
        }
      />
      {(state.error || state.done) && (
        <CardBody>
          {state.error && (
            <Notice tone="bad" live="alert">
              {state.error}
            </Notice>
          )}
          {state.done && (
            <Notice tone="ok" live="status">
              Saved as <span className="font-mono">{state.done}</span>.
            </Notice>
          )}
        </CardBody>
      )}
    </Card>
  );
}

type Chosen =
  | { step: 'none' }
  | { step: 'checking'; name: string }
  | { step: 'bad'; name: string; doc: unknown; title: string; problems: Problem[] }
  | { step: 'good'; name: string; doc: unknown; check: DocumentCheckJson };

/** Choose a file: it is read, checked against the plant (nothing kept), then kept as a draft on request. */
function ImportCard({ waiting }: { waiting: ProcessImportJson | undefined }) {
  const draft = useDraftImport();
  const [chosen, setChosen] = useState<Chosen>({ step: 'none' });
  const [note, setNote] = useState('');
  const [inputKey, setInputKey] = useState(0);

  const onFile = async (e: ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    draft.reset();
    if (!file) return setChosen({ step: 'none' });
    setChosen({ step: 'checking', name: file.name });
    let doc: unknown;
    try {
      doc = JSON.parse(await file.text());
    } catch (err) {
      return setChosen({
        step: 'bad',
        name: file.name,
        doc: null,
        title: `${file.name} is not a JSON file Coretrail can read.`,
        problems: [{ path: '', message: err instanceof Error ? err.message : String(err) }],
      });
    }
    try {
      setChosen({ step: 'good', name: file.name, doc, check: await checkProcessDocument(doc) });
    } catch (err) {
      setChosen({
        step: 'bad',
        name: file.name,
        doc,
        title: err instanceof ApiError ? err.message : String(err),
        problems: err instanceof ApiError ? problemsOf(err) : [],
      });
    }
  };

  const onImport = async () => {
    if (chosen.step !== 'good') return;
    try {
      await draft.mutateAsync({ doc: chosen.doc, note });
      setChosen({ step: 'none' });
      setNote('');
      setInputKey((k) => k + 1);
    } catch (err) {
      if (err instanceof ApiError && Object.keys(err.fields).length) {
        setChosen({ step: 'bad', name: chosen.name, doc: chosen.doc, title: err.message, problems: problemsOf(err) });
      }
    }
  };

  const c = chosen.step === 'good' ? chosen.check : null;
  return (
    <Card labelledBy="import-heading">
      <CardHeader
        id="import-heading"
        title="Import a process document"
        description="The file is checked against the plant first and nothing is kept until you import it as a draft. A draft changes nothing until someone other than you approves it with a signature."
      />
      <CardBody>
        <div className="flex flex-col gap-4">
          {waiting && waiting.id !== draft.data?.id && (
            <Notice tone="hold">
              Import {waiting.id} is already a draft: it is approved or discarded above before another is imported.
            </Notice>
          )}
          <Field
            id="document-file"
            label="Process document (JSON)"
            hint="A file downloaded from Coretrail, or one made to its format (docs/process-document.md)."
          >
            <input
              key={inputKey}
              id="document-file"
              type="file"
              accept="application/json,.json"
              aria-describedby="document-file-hint"
              onChange={(e) => void onFile(e)}
              className="block min-h-12 w-full max-w-xl cursor-pointer rounded-control border border-rule-strong bg-field p-1.5 text-ink file:mr-3 file:min-h-9 file:cursor-pointer file:rounded-control file:border file:border-rule-strong file:bg-card file:px-3.5 file:font-medium file:text-ink hover:file:bg-sunk"
            />
          </Field>
          {chosen.step === 'checking' && (
            <p aria-busy="true" className="text-ink-soft">
              Checking {chosen.name}…
            </p>
          )}
          {chosen.step === 'bad' && (
            <DocumentProblems title={chosen.title} problems={chosen.problems} doc={chosen.doc} />
          )}
          {draft.error && !(draft.error instanceof ApiError && Object.keys(draft.error.fields).length) && (
            <Notice tone="bad" live="alert">
              {draft.error.message}
            </Notice>
          )}
          {draft.data && chosen.step === 'none' && (
            <Notice tone="ok" live="status">
              Import {draft.data.id} is a draft. It changes nothing until someone other than you approves it.
            </Notice>
          )}
          {c && (
            <div className="flex flex-col gap-4">
              <Notice tone="ok" live="status" title={`${chosen.step === 'good' ? chosen.name : ''} fits the plant.`}>
                It names {plural(c.new.partKinds, 'new part kind')},{' '}
                {plural(c.new.families, 'new engine family', 'new engine families')} and{' '}
                {plural(c.new.stages, 'new stage')}, with {plural(c.characteristics, 'characteristic')},{' '}
                {plural(c.routes, 'route')} and {plural(c.castingNumbers, 'casting number')} in all. Importing it shows
                exactly what it adds and what it keeps.
              </Notice>
              <Field id="import-note" label="Why (kept with the import, optional)">
                <Textarea id="import-note" value={note} maxLength={500} onChange={(e) => setNote(e.target.value)} />
              </Field>
              <div>
                <Button
                  variant="primary"
                  onClick={() => void onImport()}
                  disabled={draft.isPending}
                  aria-busy={draft.isPending}
                >
                  Import as a draft
                </Button>
              </div>
            </div>
          )}
        </div>
      </CardBody>
    </Card>
  );
}

/** What an import adds, which routes get a new version, and how much it keeps as it is. */
export function PlanList({ plan }: { plan: ImportPlan }) {
  const adds: [string, string, string, string[]][] = [
    ['part kinds', 'part kind', 'part kinds', plan.partKinds],
    ['families', 'engine family', 'engine families', plan.families],
    ['stages', 'stage', 'stages', plan.stages],
    ['characteristics', 'characteristic', 'characteristics', plan.characteristics],
    ['casting numbers', 'casting number', 'casting numbers', plan.castingNumbers],
  ];
  const added = adds.filter(([, , , list]) => list.length > 0);
  return (
    <dl className="grid grid-cols-1 gap-x-4 gap-y-2 md:grid-cols-[12rem_minmax(0,1fr)]">
      <dt className="font-semibold">Adds</dt>
      <dd>
        {added.length ? (
          <ul className="flex flex-col gap-1">
            {added.map(([key, one, many, list]) => (
              <li key={key}>
                {list.length} {list.length === 1 ? one : many}:{' '}
                <span className="font-mono text-[0.9rem]">{list.join(', ')}</span>
              </li>
            ))}
          </ul>
        ) : (
          'Nothing new'
        )}
      </dd>
      <dt className="font-semibold">New route versions</dt>
      <dd>
        {plan.routes.length ? (
          <ul className="flex flex-col gap-1">
            {plan.routes.map((r) => (
              <li key={r}>
                <span className="font-mono text-[0.9rem]">{r}</span>: a new version with the document’s stages
              </li>
            ))}
          </ul>
        ) : (
          'None: every route in it is as in force'
        )}
      </dd>
      <dt className="font-semibold">Kept as they are</dt>
      <dd>
        {plural(plan.kept, 'thing')} the plant already has under the same code. Change those on their own screens, under
        their own change control.
      </dd>
    </dl>
  );
}

function DraftCard({
  imp,
  me,
  onApproved,
}: {
  imp: ProcessImportJson;
  me: SignedIn;
  onApproved: (imp: ProcessImportJson) => void;
}) {
  const approve = useApproveImport();
  const discard = useDiscardImport();
  const [problems, setProblems] = useState<{ title: string; list: Problem[] } | null>(null);
  const own = imp.createdById === me.user.id;
  return (
    <Card labelledBy="draft-import-heading">
      <CardHeader
        id="draft-import-heading"
        title={`Import ${imp.id}: waiting for approval`}
        description={`Imported by ${imp.createdBy ?? 'someone no longer listed'}, ${formatWhen(imp.createdAt)}. Nothing in it is in force until it is approved.`}
        actions={<Badge tone="wait">Draft</Badge>}
      />
      <CardBody>
        <div className="flex flex-col gap-5">
          {imp.note && <p>{imp.note}</p>}
          <section aria-label="What the import changes">
            <PlanList plan={imp.plan} />
          </section>
          {problems && <DocumentProblems title={problems.title} problems={problems.list} doc={null} />}
          {discard.error && (
            <Notice tone="bad" live="alert">
              {discard.error.message}
            </Notice>
          )}
          {own ? (
            <Notice tone="info">Someone else approves this draft: you imported it.</Notice>
          ) : me.can('process.approve') ? (
            <section aria-label={`Approve import ${imp.id}`} className="border-t border-rule pt-4">
              <SignChange
                label="Approve and sign"
                signer={me.user.name}
                meaning="approve this import and apply it to the plant’s process"
                subject={`process import ${imp.id}`}
                onSign={async (body) => {
                  setProblems(null);
                  try {
                    onApproved(await approve.mutateAsync({ id: imp.id, ...body }));
                  } catch (err) {
                    // the document no longer fits the plant: its problems by path (a password or
                    // reason refused is shown on the form itself)
                    const list = err instanceof ApiError ? problemsOf(err).filter((p) => !SIGN_FIELDS.has(p.path)) : [];
                    if (err instanceof ApiError && list.length) setProblems({ title: err.message, list });
                    throw err;
                  }
                }}
              >
                Each route it names gets a new approved version from the time it takes effect; parts already on a route
                keep their version.
              </SignChange>
            </section>
          ) : (
            <Notice tone="info">A quality engineer other than its importer approves it with their signature.</Notice>
          )}
          <div className="flex flex-wrap gap-2">
            <Button
              variant="danger"
              onClick={() => discard.mutate(imp.id)}
              disabled={discard.isPending}
              aria-busy={discard.isPending}
            >
              Discard import {imp.id}
            </Button>
          </div>
        </div>
      </CardBody>
    </Card>
  );
}

function planSummary(plan: ImportPlan): string {
  const added =
    plan.partKinds.length +
    plan.families.length +
    plan.stages.length +
    plan.characteristics.length +
    plan.castingNumbers.length;
  return `Adds ${plural(added, 'thing')}; ${plural(plan.routes.length, 'new route version')}; keeps ${plan.kept} as ${plan.kept === 1 ? 'it is' : 'they are'}`;
}

function PastImports({ imports }: { imports: ProcessImportJson[] }) {
  return (
    <Card labelledBy="imports-heading">
      <CardHeader id="imports-heading" title="Imports" description="Every process document imported, newest first." />
      <TableFrame>
        <Table caption="Imports">
          <THead>
            <tr>
              <TH>Import</TH>
              <TH>Status</TH>
              <TH>Imported by</TH>
              <TH>Approved by</TH>
              <TH>What it does</TH>
            </tr>
          </THead>
          <TBody>
            {imports.map((i) => (
              <TR key={i.id} muted={i.status === 'discarded'}>
                <TD mono nowrap>
                  {i.id}
                </TD>
                <TD>
                  <Badge tone={STATUS[i.status].tone}>{STATUS[i.status].label}</Badge>
                </TD>
                <TD>
                  <span className="flex flex-col leading-snug">
                    <span>{i.createdBy ?? '—'}</span>
                    <span className="font-mono text-sm text-ink-soft">{formatWhen(i.createdAt)}</span>
                  </span>
                </TD>
                <TD>
                  {i.approvedBy ? (
                    <span className="flex flex-col leading-snug">
                      <span>{i.approvedBy}</span>
                      <span className="font-mono text-sm text-ink-soft">{formatWhen(i.approvedAt)}</span>
                      {i.effectiveFrom && i.effectiveFrom !== i.approvedAt && (
                        <span className="text-sm text-ink-soft">In force from {formatWhen(i.effectiveFrom)}</span>
                      )}
                    </span>
                  ) : (
                    <span className="text-ink-soft">—</span>
                  )}
                </TD>
                <TD>
                  <span className="flex flex-col leading-snug">
                    <span>{planSummary(i.plan)}</span>
                    {(i.approvalReason || i.note) && (
                      <span className="text-sm text-ink-soft">{i.approvalReason ?? i.note}</span>
                    )}
                  </span>
                </TD>
              </TR>
            ))}
            {imports.length === 0 && <EmptyRow colSpan={5}>No process document has been imported yet.</EmptyRow>}
          </TBody>
        </Table>
      </TableFrame>
    </Card>
  );
}

export function DocumentPage() {
  const me = useSignedIn();
  const imports = useImports();
  const list = imports.data ?? [];
  const waiting = list.find((i) => i.status === 'draft');
  const [approved, setApproved] = useState<ProcessImportJson | null>(null);
  return (
    <>
      <PageHeader
        title="Process document"
        description="The plant’s whole process definition as one file: download it to keep or review, or import one. An import is a change like any other: a draft until someone other than its importer approves it with a signature."
        actions={
          <>
            <ButtonLink to={paths.process}>Process</ButtonLink>
            <ButtonLink to={paths.routes}>Routes</ButtonLink>
          </>
        }
      />
      {imports.error && (
        <div className="mb-4">
          <Notice tone="bad" live="alert">
            {imports.error.message}
          </Notice>
        </div>
      )}
      <div className="flex flex-col gap-6">
        {approved && (
          <Notice tone="ok" live="status" title={`Import ${approved.id} approved.`}>
            Signed by {approved.approvedBy}; in force from {formatWhen(approved.effectiveFrom)}. What it added is on the{' '}
            Process and Routes pages.
          </Notice>
        )}
        <DownloadCard />
        {waiting && me && <DraftCard key={waiting.id} imp={waiting} me={me} onApproved={setApproved} />}
        <ImportCard waiting={waiting} />
        <PastImports imports={list} />
      </div>
    </>
  );
}
