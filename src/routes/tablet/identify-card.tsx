import { useId, useState } from 'react';
import { Button } from '../../components/ui/button';
import { Card, CardBody } from '../../components/ui/card';
import { Input } from '../../components/ui/input';
import { Label } from '../../components/ui/field';

/**
 * Who takes the next reading: a badge scan (the scanner types it and presses Enter) and a short
 * PIN. Kept for one result only, so the next person on the tablet names themselves again.
 */
export function IdentifyCard({
  who,
  onIdentify,
  onClear,
}: {
  who: { badge: string } | null;
  onIdentify: (who: { badge: string; pin: string }) => void;
  onClear: () => void;
}) {
  const badgeId = useId();
  const pinId = useId();
  const [badge, setBadge] = useState('');
  const [pin, setPin] = useState('');
  const [note, setNote] = useState<string | null>(null);
  if (who) {
    return (
      <Card labelledBy="who-heading">
        <CardBody>
          <div className="flex flex-wrap items-center justify-between gap-3">
            <p id="who-heading" role="status" className="text-lg">
              Recording as badge <span className="font-mono font-semibold">{who.badge}</span>. Your PIN is checked when
              you record.
            </p>
            <Button size="lg" onClick={onClear}>
              Not me
            </Button>
          </div>
        </CardBody>
      </Card>
    );
  }
  return (
    <Card labelledBy="who-heading">
      <CardBody>
        <h2 id="who-heading" className="mb-2 text-xl font-semibold">
          Who is recording
        </h2>
        <form
          className="grid grid-cols-1 items-end gap-3 sm:grid-cols-[minmax(0,1fr)_12rem_auto]"
          onSubmit={(e) => {
            e.preventDefault();
            const b = badge.trim().toUpperCase();
            if (!/^[A-Z0-9-]{3,40}$/.test(b)) return setNote('Scan your badge.');
            if (!/^\d{4,8}$/.test(pin)) return setNote('A PIN is 4 to 8 digits.');
            setNote(null);
            onIdentify({ badge: b, pin });
            setBadge('');
            setPin('');
          }}
        >
          <div>
            <Label htmlFor={badgeId}>Badge</Label>
            <Input
              id={badgeId}
              mono
              autoComplete="off"
              value={badge}
              onChange={(e) => setBadge(e.target.value)}
              aria-describedby={note ? `${badgeId}-note` : undefined}
            />
          </div>
          <div>
            <Label htmlFor={pinId}>PIN</Label>
            <Input
              id={pinId}
              type="password"
              inputMode="numeric"
              autoComplete="off"
              value={pin}
              onChange={(e) => setPin(e.target.value.replace(/\D/g, '').slice(0, 8))}
            />
          </div>
          <Button type="submit" variant="primary" size="lg">
            That’s me
          </Button>
        </form>
        {note && (
          <p id={`${badgeId}-note`} role="alert" className="mt-2 font-medium text-bad">
            {note}
          </p>
        )}
      </CardBody>
    </Card>
  );
}
