import type { QueryClient } from '@tanstack/react-query';
import { useParams, type LoaderFunctionArgs } from 'react-router';
import { useSignedIn } from '../../api/auth/me';
import { defectCodesQueryOptions, useDefectCodes } from '../../api/defect-codes/defect-codes';
import { ncrQueryOptions, useNcr } from '../../api/ncrs/ncr';
import { PageHeader } from '../../components/page-header';
import { ButtonLink } from '../../components/ui/button';
import { formatWhen, plural } from '../../lib/format';
import { ApiError } from '../../lib/http';
import { openCaHref, paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { NcrActions, NcrDecision } from './ncr-actions';
import { NcrAssignee } from './ncr-assign';
import { NcrStateBadge, SeverityMark } from './ncr-badges';
import { NcrContainment } from './ncr-containment';
import { NcrFindings, NcrPhotos } from './ncr-findings';
import { NcrSignatures, NcrTimeline } from './ncr-history';
import { defectDescription } from './defect-options';
import { NcrLot } from './ncr-lot';
import { NcrPart } from './ncr-part';

const NCR_NUMBER = /^NC-\d{4}-\d{5,}$/;
const canonicalNumber = (raw: string | undefined) => (raw ?? '').trim().toUpperCase();

export const ncrLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'ncr.read');
    const number = canonicalNumber(params.number);
    if (!NCR_NUMBER.test(number)) {
      throw new ApiError(400, { code: 'invalid', message: 'An NCR number looks like NC-2026-00042.' });
    }
    await Promise.all([
      queryClient.ensureQueryData(ncrQueryOptions(number)),
      queryClient.ensureQueryData(defectCodesQueryOptions()),
    ]);
    return null;
  };

export function NcrPage() {
  const me = useSignedIn();
  const { data: ncr } = useNcr(canonicalNumber(useParams().number));
  const defects = useDefectCodes().data;
  if (!me || !ncr) return null;
  const canDecide = me.can('ncr.disposition');
  const defect = defectDescription(defects, ncr.defectCode);

  return (
    <>
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-x-4 gap-y-2">
            <span className="font-mono tracking-wide">{ncr.number}</span>
            <span className="flex flex-wrap items-center gap-2 text-base font-normal tracking-normal">
              <NcrStateBadge state={ncr.state} />
              <SeverityMark severity={ncr.severity} />
              {ncr.defectCode && (
                <span className="rounded-control border border-rule-strong bg-card px-1.5 py-0.5 text-sm">
                  <span className="font-mono font-semibold">{ncr.defectCode}</span>
                  {defect && <span className="text-ink-soft"> {defect}</span>}
                </span>
              )}
            </span>
          </span>
        }
        description={
          <span className="flex flex-wrap items-center gap-x-2 gap-y-1">
            <span>
              Raised <span className="font-mono text-ink">{formatWhen(ncr.raisedAt)}</span> by {ncr.raisedBy} ·{' '}
              {ncr.ageDays === 0 ? 'today' : `${plural(ncr.ageDays, 'day')} ago`} ·
            </span>
            <NcrAssignee ncr={ncr} me={me.user} canDecide={canDecide} />
          </span>
        }
        actions={
          <>
            {me.can('corrective-actions.manage') && (
              <ButtonLink to={openCaHref({ ncrs: [ncr.number] })} icon="plus">
                Open a corrective action
              </ButtonLink>
            )}
            <ButtonLink to={paths.ncrs}>All NCRs</ButtonLink>
          </>
        }
      />
      {/* on a wide screen the steps sit beside the record; narrower, they follow what was found */}
      <div className="grid grid-cols-1 items-start gap-5 xl:grid-flow-dense xl:grid-cols-[minmax(0,1fr)_26rem]">
        <div className="flex flex-col gap-5 xl:col-start-1">
          {ncr.lot ? <NcrLot ncr={ncr} lot={ncr.lot} canOpenLot={me.can('trail.read')} /> : <NcrPart ncr={ncr} />}
          <NcrFindings ncr={ncr} />
        </div>
        <div className="flex flex-col gap-5 xl:col-start-2 xl:row-span-2 xl:row-start-1">
          <NcrDecision ncr={ncr} />
          <NcrActions ncr={ncr} me={me.user} canDecide={canDecide} />
        </div>
        <div className="flex flex-col gap-5 xl:col-start-1">
          <NcrContainment ncr={ncr} canEdit={canDecide} />
          <NcrPhotos ncr={ncr} />
          <NcrTimeline ncr={ncr} />
          <NcrSignatures ncr={ncr} />
        </div>
      </div>
    </>
  );
}
