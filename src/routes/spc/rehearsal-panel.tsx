import { useState } from 'react';
import type { RehearsalJson } from '../../../shared/schemas/spc';
import type { RuleJson } from '../../../shared/schemas/spec';
import { useRehearsals } from '../../api/spc/rehearsals';
import { useRehearseRule } from '../../api/spc/rehearse';
import { Badge } from '../../components/ui/badge';
import { Button } from '../../components/ui/button';
import { Field } from '../../components/ui/field';
import { Input } from '../../components/ui/input';
import { Notice } from '../../components/ui/notice';
import { ApiError } from '../../lib/http';
import { defaultPeriod } from './filter';
import { RehearsalCounts, RehearsalDetail } from './rehearsal-summary';

/** The newest rehearsal of the draft's limits as they are now; none when the draft changed since. */
export const currentRehearsal = (rows: RehearsalJson[] | undefined) => rows?.find((r) => !r.stale) ?? null;

/**
 * Rehearse a draft before it is signed: its limits replayed over a period's stored readings by the
 * station's own judge. Each run is kept as a record; the approval keeps the one its signer saw.
 */
export function RehearsalPanel({ rule, canRun, canTrail }: { rule: RuleJson; canRun: boolean; canTrail: boolean }) {
  const list = useRehearsals(rule.id);
  const rehearse = useRehearseRule();
  const [period, setPeriod] = useState(defaultPeriod);
  const [station, setStation] = useState('');
  const latest = list.data?.[0] ?? null;
  const usable = currentRehearsal(list.data);
  const failure = rehearse.error;

  return (
    <section aria-labelledby={`rehearsal-${rule.id}`} className="flex flex-col gap-3 border-t border-rule pt-4">
      <h3 id={`rehearsal-${rule.id}`} className="flex flex-wrap items-center gap-2 text-base font-semibold">
        Rehearsal over stored readings
        {latest &&
          (latest.stale ? <Badge tone="wait">Out of date: the draft changed</Badge> : <Badge tone="ok">Current</Badge>)}
      </h3>
      <p className="text-sm text-ink-soft">
        Before this version is signed: which parts already measured would change verdict under it, what Cpk would
        become, and which shipped units hold a part that would now fail. Nothing is changed: readings keep the version
        they were judged by.
      </p>
      {canRun && (
        <form
          data-density="floor"
          className="grid grid-cols-2 items-end gap-3 md:grid-cols-4"
          onSubmit={(e) => {
            e.preventDefault();
            rehearse.mutate({
              ruleId: rule.id,
              body: { from: period.from, to: period.to, station: station.trim() || undefined },
            });
          }}
        >
          <Field id={`reh-from-${rule.id}`} label="Readings from">
            <Input
              id={`reh-from-${rule.id}`}
              type="date"
              value={period.from}
              onChange={(e) => setPeriod({ ...period, from: e.target.value })}
            />
          </Field>
          <Field id={`reh-to-${rule.id}`} label="To (included)">
            <Input
              id={`reh-to-${rule.id}`}
              type="date"
              value={period.to}
              onChange={(e) => setPeriod({ ...period, to: e.target.value })}
            />
          </Field>
          <Field id={`reh-station-${rule.id}`} label="Station (optional)">
            <Input
              id={`reh-station-${rule.id}`}
              mono
              placeholder="Every station"
              value={station}
              onChange={(e) => setStation(e.target.value.toUpperCase())}
            />
          </Field>
          <Button
            type="submit"
            variant={usable ? 'secondary' : 'primary'}
            disabled={rehearse.isPending}
            aria-busy={rehearse.isPending}
          >
            {rehearse.isPending ? 'Rehearsing…' : 'Rehearse'}
          </Button>
        </form>
      )}
      {failure && (
        <Notice tone="bad" live="alert">
          {failure instanceof ApiError
            ? [failure.message, ...Object.values(failure.fields)].join(' ')
            : 'Something went wrong. Try again.'}
        </Notice>
      )}
      {latest ? (
        <div className="flex flex-col gap-4" aria-live="polite">
          <RehearsalCounts rehearsal={latest} />
          <RehearsalDetail rehearsal={latest} canTrail={canTrail} />
        </div>
      ) : (
        !list.isPending && <p className="text-ink-soft">Not rehearsed yet.</p>
      )}
    </section>
  );
}
