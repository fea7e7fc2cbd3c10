import { Link } from 'react-router';
import { useSignedIn } from '../../api/auth/me';
import { useClaims } from '../../api/warranty/claims';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { claimHref, logClaimHref } from '../../lib/paths';
import { ClaimStateBadge, CoveredBadge } from '../warranty/claim-words';

/** The unit's warranty claims, and the way to log one while it is out in the field. */
export function TrailClaims({ unit, shipped }: { unit: string; shipped: boolean }) {
  const me = useSignedIn();
  const reads = me?.can('warranty.read') ?? false;
  const claims = useClaims({ q: unit, pageSize: 20 }, reads);
  if (!reads) return null;
  const rows = (claims.data?.rows ?? []).filter((c) => c.unit.serial === unit);
  const open = rows.some((c) => c.state !== 'closed');
  return (
    <Card labelledBy="trail-claims-heading">
      <CardHeader
        id="trail-claims-heading"
        title="Warranty claims"
        actions={
          shipped &&
          !open &&
          me?.can('warranty.record') && (
            <ButtonLink to={logClaimHref(unit)} size="sm" icon="plus">
              Log a claim
            </ButtonLink>
          )
        }
      />
      <CardBody>
        {rows.length ? (
          <ul className="flex flex-col gap-2">
            {rows.map((c) => (
              <li key={c.number} className="flex flex-wrap items-center gap-2">
                <Link to={claimHref(c.number)} className="font-mono font-semibold text-accent underline">
                  {c.number}
                </Link>
                <ClaimStateBadge state={c.state} />
                <CoveredBadge covered={c.covered} />
                <span className="text-sm text-ink-soft">failed {c.failedOn}</span>
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-ink-soft">None.</p>
        )}
      </CardBody>
    </Card>
  );
}
