import type { ReactNode } from 'react';
import { LIMIT_TYPE_LABELS, type RuleHistoryJson, type RuleJson } from '../../../shared/schemas/spec';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { formatWhen } from '../../lib/format';
import { definitionText, formatNumber, ruleLimitsText, shownState, sizeClassesText } from './limits';

/** The signature as recorded: who, when, and what the signing meant. */
export function SignatureBlock({ rule }: { rule: RuleJson }) {
  const s = rule.signature;
  if (!s) return <p className="text-sm text-ink-soft">No signature is recorded for this version.</p>;
  return (
    <figure className="rounded-control border border-rule-strong bg-field px-4 py-3">
      <figcaption className="mb-1.5 flex items-center gap-1.5 text-xs font-semibold uppercase tracking-wide text-ink-soft">
        <Icon name="key" size={16} />
        Electronic signature
      </figcaption>
      <dl className="grid grid-cols-[8rem_minmax(0,1fr)] gap-x-3 gap-y-1 text-[0.95rem]">
        <dt className="text-ink-soft">Printed name</dt>
        <dd className="font-semibold">{s.printedName}</dd>
        <dt className="text-ink-soft">Signed at</dt>
        <dd className="font-mono">{formatWhen(s.signedAt, { seconds: true })}</dd>
        <dt className="text-ink-soft">Meaning</dt>
        <dd>{s.meaning}</dd>
      </dl>
    </figure>
  );
}

function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="contents">
      <dt className="text-sm font-medium text-ink-soft">{label}</dt>
      <dd className="min-w-0">{children}</dd>
    </div>
  );
}

/** One approved version: its limits, when it holds, who approved it and why, the signature. */
export function RuleSummary({ rule, history }: { rule: RuleJson; history: RuleHistoryJson }) {
  const c = history.characteristic;
  const how = definitionText(rule);
  const unit = rule.unit ?? c.unit;
  return (
    <div className="flex flex-col gap-4">
      <div>
        <p className="font-mono text-2xl font-semibold">{ruleLimitsText(rule, c)}</p>
        <p className="text-sm text-ink-soft">
          {LIMIT_TYPE_LABELS[rule.limitType]}
          {how && <span className="font-mono"> · {how}</span>}
        </p>
      </div>
      <dl className="grid grid-cols-1 gap-x-4 gap-y-2 sm:grid-cols-[9rem_minmax(0,1fr)]">
        {rule.sizeClasses.length > 0 && (
          <Row label="Size classes">
            <span className="font-mono">{sizeClassesText(rule)}</span>
          </Row>
        )}
        <Row label="Resolution">
          <span className="font-mono">
            {formatNumber(rule.resolution)}
            {unit ? ` ${unit}` : ''}
          </span>{' '}
          <span className="text-sm text-ink-soft">(readings are rounded to this before judging)</span>
        </Row>
        <Row label="Effective from">
          <span className="font-mono">{formatWhen(rule.effectiveFrom)}</span>
          {rule.supersededAt && (
            <span className="text-ink-soft">
              {' '}
              until <span className="font-mono">{formatWhen(rule.supersededAt)}</span>
            </span>
          )}
        </Row>
        <Row label="Drafted by">
          {rule.createdBy} <span className="font-mono text-sm text-ink-soft">{formatWhen(rule.createdAt)}</span>
        </Row>
        <Row label="Approved by">{rule.approvedBy ?? '—'}</Row>
        <Row label="Reason">{rule.approvalReason ?? '—'}</Row>
        <Row label="Source">{rule.sourceNote || <span className="text-ink-soft">No source noted.</span>}</Row>
      </dl>
      <SignatureBlock rule={rule} />
    </div>
  );
}

/** The version readings are judged by now, and one approved to take over later if there is one. */
export function RuleCard({ history }: { history: RuleHistoryJson }) {
  const c = history.characteristic;
  const rule = c.inForce;
  if (c.kind === 'attribute') {
    return (
      <Card labelledBy="in-force-heading">
        <CardHeader id="in-force-heading" title="In force" />
        <CardBody>
          <p className="font-mono text-2xl font-semibold">Pass / fail</p>
          <p className="mt-1 text-ink-soft">
            A pass/fail check: the operator records pass or fail, so there are no limits to set and no versions to
            approve.
          </p>
        </CardBody>
      </Card>
    );
  }
  return (
    <>
      <Card labelledBy="in-force-heading">
        <CardHeader
          id="in-force-heading"
          title={rule ? `Version ${rule.version} in force` : 'No version in force'}
          actions={rule && <Badge tone={shownState(rule).tone}>{shownState(rule).label}</Badge>}
        />
        <CardBody>
          {rule ? (
            <RuleSummary rule={rule} history={history} />
          ) : (
            <Notice tone="hold" title="Readings cannot be judged yet">
              No version of this rule is approved for the {history.family.code}. Stations record the readings but cannot
              pass or fail them until one is.
            </Notice>
          )}
        </CardBody>
      </Card>
      {c.scheduled && (
        <Card labelledBy="scheduled-heading">
          <CardHeader
            id="scheduled-heading"
            title={`Version ${c.scheduled.version} takes effect ${formatWhen(c.scheduled.effectiveFrom)}`}
            description="Approved and signed; it supersedes the version in force at that time."
          />
          <CardBody>
            <RuleSummary rule={c.scheduled} history={history} />
          </CardBody>
        </Card>
      )}
    </>
  );
}
