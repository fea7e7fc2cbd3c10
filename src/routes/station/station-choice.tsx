import { useId, useState } from 'react';
import type { Station } from '../../../shared/schemas/reference';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { bigControl, bigLabel } from './controls';

type StationChoiceProps = {
  stations: Station[];
  current: Station | null;
  /** A code stored on this tablet that is no longer a recording station. */
  stale: string | null;
  onChoose: (code: string) => void;
  onCancel?: () => void;
};

/** Stations by where they stand on the floor, so the one beside the tablet is quick to find. */
function byLocation(stations: Station[]) {
  const m = new Map<string, Station[]>();
  for (const s of [...stations].sort((a, b) => a.name.localeCompare(b.name))) {
    const k = s.location || 'Elsewhere';
    m.set(k, [...(m.get(k) ?? []), s]);
  }
  return [...m.entries()].sort(([a], [b]) => a.localeCompare(b));
}

export function StationChoice({ stations, current, stale, onChoose, onCancel }: StationChoiceProps) {
  const id = useId();
  const [code, setCode] = useState(current?.code ?? '');
  const [tried, setTried] = useState(false);
  const missing = tried && !code;
  return (
    <Card labelledBy={`${id}-title`}>
      <CardHeader
        id={`${id}-title`}
        title="Choose this tablet's station"
        description="The tablet remembers it: every part scanned here is recorded at this station until it is changed."
      />
      <CardBody>
        <form
          noValidate
          className="flex flex-col gap-4"
          onSubmit={(e) => {
            e.preventDefault();
            setTried(true);
            if (code) onChoose(code);
          }}
        >
          {stale && (
            <Notice tone="hold" title={`Station ${stale} is not recording now`}>
              It is out of service or records no stage. Choose where this tablet is now.
            </Notice>
          )}
          <div className="flex max-w-2xl flex-col gap-1.5">
            <label htmlFor={id} className={bigLabel}>
              Station
            </label>
            <span className="relative block">
              <select
                id={id}
                value={code}
                autoFocus
                onChange={(e) => setCode(e.target.value)}
                aria-invalid={missing ? true : undefined}
                aria-describedby={missing ? `${id}-error` : undefined}
                className={`${bigControl} h-14 appearance-none pr-10`}
              >
                <option value="">Choose the station</option>
                {byLocation(stations).map(([location, group]) => (
                  <optgroup key={location} label={location}>
                    {group.map((s) => (
                      <option key={s.code} value={s.code}>
                        {s.name} ({s.code}) — {s.stageName}
                      </option>
                    ))}
                  </optgroup>
                ))}
              </select>
              <span className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-ink-soft">
                <Icon name="chevronDown" size={20} />
              </span>
            </span>
            {missing && (
              <p id={`${id}-error`} className="flex items-start gap-1.5 text-base font-semibold text-bad">
                <Icon name="bad" size={18} className="mt-0.5" />
                Choose the station this tablet stands at.
              </p>
            )}
          </div>
          <div className="flex flex-wrap gap-3">
            <Button type="submit" variant="primary" size="lg">
              Use this station
            </Button>
            {onCancel && current && (
              <Button size="lg" onClick={onCancel}>
                Keep {current.name}
              </Button>
            )}
          </div>
        </form>
      </CardBody>
    </Card>
  );
}
