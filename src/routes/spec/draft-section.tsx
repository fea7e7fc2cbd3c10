import { useState } from 'react';
import type { RuleHistoryJson, RuleJson } from '../../../shared/schemas/spec';
import type { SignedIn } from '../../api/auth/me';
import { useCreateDraft } from '../../api/spec/create-draft';
import { useDiscardDraft } from '../../api/spec/discard-draft';
import { Badge } from '../../components/ui/badge';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { formatWhen } from '../../lib/format';
import { ApiError } from '../../lib/http';
import { RehearsalPanel } from '../spc/rehearsal-panel';
import { ApproveDialog } from './approve-dialog';
import { DraftForm } from './draft-form';
import { definitionText, limitsFrom, ruleLimitsText } from './limits';

const NEVER_EDITED = 'An approved version is never edited; start a new draft.';

/** The version a new draft copies: the one waiting to take over, else the one in force, else the last approved. */
function copySource(history: RuleHistoryJson): RuleJson | null {
  const c = history.characteristic;
  return (
    c.scheduled ??
    c.inForce ??
    history.versions.find((v) => v.status === 'approved' || v.status === 'superseded') ??
    null
  );
}

const errorText = (err: unknown) => (err instanceof ApiError ? err.message : 'Something went wrong. Try again.');

/** A draft for those who may read the spec book but not edit it. */
function DraftReadOnly({ history, draft }: { history: RuleHistoryJson; draft: RuleJson }) {
  const how = definitionText(draft);
  return (
    <div className="flex flex-col gap-1">
      <p className="font-mono text-xl font-semibold">{ruleLimitsText(draft, history.characteristic)}</p>
      {how && <p className="font-mono text-sm text-ink-soft">{how}</p>}
      <p className="text-sm text-ink-soft">
        Drafted by {draft.createdBy}, <span className="font-mono">{formatWhen(draft.createdAt)}</span>. Not in force:
        stations keep judging by the version in force until a quality engineer approves this one.
      </p>
    </div>
  );
}

type DraftSectionProps = { history: RuleHistoryJson; me: SignedIn; onMessage: (text: string) => void };

/** The next version: start it, edit it, discard it, or approve it with a signature. */
export function DraftSection({ history, me, onMessage }: DraftSectionProps) {
  const create = useCreateDraft();
  const discard = useDiscardDraft();
  const [fresh, setFresh] = useState(false);
  const [approving, setApproving] = useState(false);
  const c = history.characteristic;
  const canEdit = me.can('spec.edit');
  const draft = c.draft;
  // separation of duties: the author of a draft never approves it
  const ownDraft = !!draft && draft.createdById === me.user.id;
  const canApprove = me.can('spec.approve') && !ownDraft;
  if (c.kind === 'attribute') return null;
  if (!draft && !canEdit) return null;

  const start = async () => {
    const source = copySource(history);
    const limits = limitsFrom(source, c);
    if (!source || !(limits.resolution > 0)) {
      setFresh(true);
      return;
    }
    try {
      const rule = await create.mutateAsync({ family: history.family.code, characteristicId: c.id, limits });
      onMessage(`Draft version ${rule.version} started as a copy of version ${source.version}. Change it, then save.`);
    } catch {
      // shown below; a 409 means someone else's draft exists, and the refreshed history shows it
    }
  };

  const onDiscard = async () => {
    if (!draft) {
      setFresh(false);
      return;
    }
    try {
      await discard.mutateAsync(draft.id);
      onMessage(`Draft version ${draft.version} discarded. It stays in the history as a discarded draft.`);
    } catch {
      // shown below
    }
  };

  const failure = create.error ?? discard.error;
  const editing = draft !== null || fresh;
  const title = draft ? `Draft version ${draft.version}` : editing ? 'New draft' : 'Next version';

  return (
    <Card labelledBy="draft-heading">
      <CardHeader
        id="draft-heading"
        title={title}
        description={
          draft
            ? `Started by ${draft.createdBy}, ${formatWhen(draft.createdAt)}. Not in force until approved.`
            : editing
              ? 'Not saved yet. Nothing is in force to copy from, so the fields start empty.'
              : undefined
        }
        actions={draft && <Badge tone="wait">Draft</Badge>}
      />
      <CardBody>
        <div className="flex flex-col gap-4">
          {failure && (
            <Notice tone="bad" live="alert">
              {errorText(failure)}
            </Notice>
          )}
          {ownDraft && me.can('spec.approve') && (
            <Notice tone="info">
              You drafted this version: another quality engineer reads it and approves it with their signature.
            </Notice>
          )}
          {!editing && (
            <div className="flex flex-wrap items-center justify-between gap-3">
              <p className="text-ink-soft">{NEVER_EDITED}</p>
              <Button
                variant="primary"
                icon="plus"
                onClick={start}
                disabled={create.isPending}
                aria-busy={create.isPending}
              >
                Start a draft
              </Button>
            </div>
          )}
          {editing && canEdit && (
            <DraftForm
              key={draft ? `${draft.id}:${JSON.stringify(limitsFrom(draft, c))}` : 'new'}
              history={history}
              draft={draft}
              canApprove={canApprove}
              discarding={discard.isPending}
              onSaved={(rule) => {
                setFresh(false);
                onMessage(`Draft version ${rule.version} saved.`);
              }}
              onDiscard={onDiscard}
              onApprove={() => setApproving(true)}
            />
          )}
          {draft && <RehearsalPanel rule={draft} canRun={canEdit} canTrail={me.can('trail.read')} />}
          {draft && !canEdit && (
            <>
              <DraftReadOnly history={history} draft={draft} />
              {canApprove && (
                <div className="flex justify-end">
                  <Button variant="primary" icon="key" onClick={() => setApproving(true)}>
                    Approve…
                  </Button>
                </div>
              )}
            </>
          )}
        </div>
      </CardBody>
      {approving && draft && (
        <ApproveDialog
          history={history}
          draft={draft}
          signer={me.user.name}
          onClose={() => setApproving(false)}
          onApproved={(rule) => {
            setApproving(false);
            const later = rule.effectiveFrom && Date.parse(rule.effectiveFrom) > Date.now() + 60_000;
            onMessage(
              `Version ${rule.version} approved and signed. ${later ? `It takes effect ${formatWhen(rule.effectiveFrom)}.` : 'It is in force now.'}`,
            );
          }}
        />
      )}
    </Card>
  );
}
