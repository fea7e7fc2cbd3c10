import { Link } from 'react-router';
import type { SignedIn } from '../../api/auth/me';
import { useExpiringQualifications } from '../../api/qualifications/qualifications';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { paths } from '../../lib/paths';

/** A supervisor's home: the qualifications that run out within 30 days (or ran out lately). */
export function ExpiringQualifications({ me }: { me: SignedIn }) {
  const show = me.user.role === 'supervisor' && me.can('qualifications.manage');
  const expiring = useExpiringQualifications(30, show);
  if (!show || !expiring.data) return null;
  const rows = expiring.data;
  return (
    <section className="mb-8">
      <Card labelledBy="expiring-q">
        <CardHeader
          id="expiring-q"
          title="Qualifications running out"
          description="Within 30 days, or ran out in the last 30. The station refuses results after the expiry day."
          actions={
            <Link to={paths.qualifications} className="text-accent underline-offset-4 hover:underline">
              All qualifications
            </Link>
          }
        />
        <CardBody>
          {rows.length === 0 ? (
            <p className="text-ink-soft">None in the next 30 days.</p>
          ) : (
            <ul className="flex flex-col gap-2" aria-label="Qualifications running out">
              {rows.map((q) => (
                <li key={q.id} className="flex flex-wrap items-center gap-x-3 gap-y-1">
                  <Badge tone={q.state === 'expired' ? 'bad' : 'wait'}>
                    {q.state === 'expired' ? 'Expired' : 'Expiring'}
                  </Badge>
                  <span className="font-medium">{q.person.name}</span>
                  <span>{q.stage.name}</span>
                  <span className="font-mono text-ink-soft">{q.expiresOn}</span>
                </li>
              ))}
            </ul>
          )}
        </CardBody>
      </Card>
    </section>
  );
}
