import { useEndOtherSessions, useOwnSessions } from '../../api/auth/sessions';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { formatWhen } from '../../lib/format';

/** A short name for a browser from its user-agent string: enough to tell a tablet from a desk. */
function browserName(ua: string | null): string {
  if (!ua) return 'Unknown browser';
  const browser = /Edg\//.test(ua)
    ? 'Edge'
    : /Chrome\//.test(ua)
      ? 'Chrome'
      : /Firefox\//.test(ua)
        ? 'Firefox'
        : /Safari\//.test(ua)
          ? 'Safari'
          : 'A browser';
  const system = /Android/.test(ua)
    ? 'Android'
    : /iPad|iPhone/.test(ua)
      ? 'iPad or iPhone'
      : /Windows/.test(ua)
        ? 'Windows'
        : /Mac OS/.test(ua)
          ? 'Mac'
          : /Linux/.test(ua)
            ? 'Linux'
            : 'another system';
  return `${browser} on ${system}`;
}

/** Where you are signed in, and "sign out everywhere else". */
export function SessionsCard() {
  const sessions = useOwnSessions();
  const endOthers = useEndOtherSessions();
  const others = (sessions.data ?? []).filter((s) => !s.current).length;

  return (
    <Card labelledBy="sessions-heading">
      <CardHeader
        id="sessions-heading"
        title="Where you are signed in"
        description="A session ends by itself after a while unused, and when you sign out or change your password."
      />
      <CardBody>
        {sessions.error && (
          <Notice tone="bad" live="alert">
            {sessions.error.message}
          </Notice>
        )}
        <ul className="flex flex-col divide-y divide-rule" aria-label="Your sessions">
          {(sessions.data ?? []).map((s) => (
            <li key={s.id} className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 py-2.5">
              <span className="font-medium">
                {browserName(s.userAgent)}
                {s.current && <span className="ml-2 text-sm font-normal text-ok">this browser</span>}
              </span>
              <span className="flex flex-wrap gap-x-3 font-mono text-sm text-ink-soft">
                <span className="whitespace-nowrap">{s.ip ?? 'address unknown'}</span>
                <span className="whitespace-nowrap">signed in {formatWhen(s.createdAt)}</span>
                <span className="whitespace-nowrap">last used {formatWhen(s.lastSeenAt)}</span>
              </span>
            </li>
          ))}
        </ul>
        {endOthers.error && (
          <Notice tone="bad" live="alert">
            {endOthers.error.message}
          </Notice>
        )}
        {endOthers.data && (
          <Notice tone="ok" live="status">
            {endOthers.data.ended === 1 ? 'One other session ended.' : `${endOthers.data.ended} other sessions ended.`}
          </Notice>
        )}
        <div className="mt-3">
          <Button
            disabled={others === 0 || endOthers.isPending}
            aria-busy={endOthers.isPending}
            onClick={() => endOthers.mutate()}
          >
            Sign out everywhere else
          </Button>
        </div>
      </CardBody>
    </Card>
  );
}
