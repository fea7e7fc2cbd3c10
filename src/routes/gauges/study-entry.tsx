import { useId, useMemo, useState, type FormEvent, type ReactNode } from 'react';
import { attributeAgreement } from '../../../shared/domain/attribute-study';
import { anovaGaugeStudy } from '../../../shared/domain/gauge-rr-anova';
import { averageAndRange } from '../../../shared/domain/gauge-rr-range';
import { StudyDataError } from '../../../shared/domain/study-error';
import type { StudyBody, StudyJson } from '../../../shared/schemas/gauges';
import { useRecordStudy } from '../../api/gauges/studies';
import { Button } from '../../components/ui/button';
import { Input } from '../../components/ui/input';
import { Notice } from '../../components/ui/notice';
import { Select } from '../../components/ui/select';
import { ApiError } from '../../lib/http';
import { AnovaTable, AttributeFigures, BandsLegend, GrrTable, RangeDetails } from './study-figures';
import {
  RatingGrid,
  VariableGrid,
  emptyCells,
  isReading,
  resize,
  type Rating,
  type RatingCells,
  type VariableCells,
} from './study-grid';

function Labelled({ label, children, hint }: { label: string; hint?: string; children: (id: string) => ReactNode }) {
  const id = useId();
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold">
        {label}
      </label>
      {children(id)}
      {hint && <p className="text-xs text-ink-soft">{hint}</p>}
    </div>
  );
}

const range = (lo: number, hi: number) =>
  Array.from({ length: hi - lo + 1 }, (_, i) => ({ value: String(lo + i), label: String(lo + i) }));

/** Runs a shared computation, turning the data's own complaint into words for the screen. */
function attempt<T>(f: () => T): { value: T } | { problem: string } {
  try {
    return { value: f() };
  } catch (err) {
    if (err instanceof StudyDataError) return { problem: err.message };
    throw err;
  }
}

type Kind = 'variable' | 'attribute';

/**
 * A new study entered on the grid. While it is being filled in, both variable methods are worked
 * out here from the same shared code the server runs, so quality sees average-and-range beside
 * ANOVA before choosing which one goes on record.
 */
export function StudyEntry({
  code,
  unit,
  onRecorded,
}: {
  code: string;
  unit: string;
  onRecorded: (s: StudyJson) => void;
}) {
  const record = useRecordStudy(code);
  const [kind, setKind] = useState<Kind>('variable');
  const [characteristic, setCharacteristic] = useState('');
  const [tolerance, setTolerance] = useState('');
  const [appraisers, setAppraisers] = useState(3);
  const [parts, setParts] = useState(10);
  const [trials, setTrials] = useState(3);
  const [method, setMethod] = useState<'range' | 'anova'>('anova');
  const [cells, setCells] = useState<VariableCells>(() => emptyCells(3, 10, 3, ''));
  const [ratings, setRatings] = useState<RatingCells>(() => emptyCells<Rating>(3, 10, 3, ''));
  const [withReference, setWithReference] = useState(true);
  const [reference, setReference] = useState<Rating[]>(() => Array.from({ length: 10 }, () => ''));
  const [problem, setProblem] = useState<string | null>(null);

  const shape = (a: number, p: number, t: number) => {
    setAppraisers(a);
    setParts(p);
    setTrials(t);
    setCells((c) => resize(c, a, p, t, ''));
    setRatings((c) => resize<Rating>(c, a, p, t, ''));
    setReference((r) => Array.from({ length: p }, (_, i) => r[i] ?? ''));
  };
  const switchKind = (k: Kind) => {
    setKind(k);
    setProblem(null);
    // a variable study takes at most 3 appraisers and 15 parts (the schema's limits)
    if (k === 'variable') shape(Math.min(appraisers, 3), Math.min(parts, 15), Math.max(2, Math.min(trials, 3)));
  };

  const filled = cells.every((byPart) => byPart.every((byTrial) => byTrial.every(isReading)));
  const readings = useMemo(() => cells.map((byPart) => byPart.map((byTrial) => byTrial.map(Number))), [cells]);
  const tol = tolerance.trim() === '' ? null : Number(tolerance);
  const tolBad = tol !== null && !(Number.isFinite(tol) && tol > 0);
  const live = useMemo(() => {
    if (kind !== 'variable' || !filled || tolBad) return null;
    return {
      range: attempt(() => averageAndRange(readings, { tolerance: tol })),
      anova: attempt(() => anovaGaugeStudy(readings, { tolerance: tol })),
    };
  }, [kind, filled, tolBad, readings, tol]);

  const judged = ratings.every((byPart) => byPart.every((byTrial) => byTrial.every((r) => r !== '')));
  const refDone = !withReference || reference.every((r) => r !== '');
  const liveAttr = useMemo(() => {
    if (kind !== 'attribute' || !judged || !refDone) return null;
    return attempt(() =>
      attributeAgreement({
        ratings,
        reference: withReference ? reference : null,
        nonconforming: withReference ? 'fail' : null,
      }),
    );
  }, [kind, judged, refDone, ratings, reference, withReference]);

  const submit = async (e: FormEvent) => {
    e.preventDefault();
    setProblem(null);
    let body: StudyBody;
    if (kind === 'variable') {
      if (!filled) return setProblem('Enter every reading: each empty or unreadable cell is outlined.');
      if (tolBad) return setProblem('The tolerance must be a number above 0, or left empty.');
      body = { method, characteristic, tolerance: tol, readings };
    } else {
      if (!judged) return setProblem('Judge every part on every trial: tap a cell for pass, again for fail.');
      if (!refDone)
        return setProblem('Give the reference answer for every part, or untick “The right answer is known”.');
      body = {
        method: 'attribute',
        characteristic,
        ratings: ratings as ('pass' | 'fail')[][][],
        reference: withReference ? (reference as ('pass' | 'fail')[]) : null,
      };
    }
    try {
      const study = await record.mutateAsync(body);
      // a clean grid for the next study, so the same readings are not recorded twice by mistake
      setCells(emptyCells(appraisers, parts, trials, ''));
      setRatings(emptyCells<Rating>(appraisers, parts, trials, ''));
      setReference(Array.from({ length: parts }, () => ''));
      onRecorded(study);
    } catch (err) {
      setProblem(err instanceof ApiError ? [err.message, ...Object.values(err.fields)].join(' ') : 'Not recorded.');
    }
  };

  const maxAppraisers = kind === 'variable' ? 3 : 5;
  const maxParts = kind === 'variable' ? 15 : 50;
  return (
    <form onSubmit={submit} className="flex flex-col gap-4" aria-label="Enter a gauge study">
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3">
        <Labelled label="Kind of study">
          {(id) => (
            <Select
              id={id}
              value={kind}
              onChange={(e) => switchKind(e.target.value as Kind)}
              options={[
                { value: 'variable', label: 'Variable gauge R&R (readings)' },
                { value: 'attribute', label: 'Attribute agreement (pass / fail)' },
              ]}
            />
          )}
        </Labelled>
        <Labelled label="What was measured">
          {(id) => (
            <Input
              id={id}
              value={characteristic}
              onChange={(e) => setCharacteristic(e.target.value)}
              placeholder={kind === 'variable' ? 'Cylinder bore diameter' : 'Crack test, block deck'}
            />
          )}
        </Labelled>
        {kind === 'variable' && (
          <Labelled
            label={`Tolerance band (${unit})`}
            hint="Upper minus lower limit; leave empty to judge by total variation."
          >
            {(id) => (
              <Input
                id={id}
                mono
                inputMode="decimal"
                value={tolerance}
                aria-invalid={tolBad || undefined}
                onChange={(e) => setTolerance(e.target.value)}
              />
            )}
          </Labelled>
        )}
        <Labelled label="Appraisers">
          {(id) => (
            <Select
              id={id}
              value={String(appraisers)}
              options={range(2, maxAppraisers)}
              onChange={(e) => shape(Number(e.target.value), parts, trials)}
            />
          )}
        </Labelled>
        <Labelled label="Parts">
          {(id) => (
            <Select
              id={id}
              value={String(parts)}
              options={range(2, maxParts)}
              onChange={(e) => shape(appraisers, Number(e.target.value), trials)}
            />
          )}
        </Labelled>
        <Labelled label="Trials">
          {(id) => (
            <Select
              id={id}
              value={String(trials)}
              options={range(2, 3)}
              onChange={(e) => shape(appraisers, parts, Number(e.target.value))}
            />
          )}
        </Labelled>
      </div>

      {kind === 'variable' ? (
        <VariableGrid cells={cells} onChange={setCells} unit={unit} />
      ) : (
        <>
          <label className="flex min-h-9 items-center gap-2 floor:min-h-12">
            <input
              type="checkbox"
              className="size-4 accent-accent floor:size-6"
              checked={withReference}
              onChange={(e) => setWithReference(e.target.checked)}
            />
            The right answer is known for each part (master parts): give it beside the part number
          </label>
          <RatingGrid
            cells={ratings}
            reference={withReference ? reference : null}
            onChange={setRatings}
            onReference={setReference}
          />
        </>
      )}

      {kind === 'variable' && live && (
        <div className="flex flex-col gap-4" aria-live="polite">
          <BandsLegend />
          <div className="grid grid-cols-1 gap-5 xl:grid-cols-2">
            <div className="flex flex-col gap-3">
              {'value' in live.range ? (
                <>
                  <GrrTable r={live.range.value} title="By average and range" label="Average and range figures" />
                  <RangeDetails r={live.range.value} />
                </>
              ) : (
                <Notice tone="hold" title="Average and range cannot take this grid">
                  {live.range.problem}.
                </Notice>
              )}
            </div>
            <div className="flex flex-col gap-3">
              {'value' in live.anova ? (
                <>
                  <GrrTable r={live.anova.value} title="By ANOVA" label="ANOVA figures" />
                  <AnovaTable r={live.anova.value} />
                </>
              ) : (
                <Notice tone="hold" title="ANOVA cannot take this grid">
                  {live.anova.problem}.
                </Notice>
              )}
            </div>
          </div>
        </div>
      )}
      {kind === 'attribute' && liveAttr && (
        <div aria-live="polite">
          {'value' in liveAttr ? (
            <AttributeFigures r={liveAttr.value} />
          ) : (
            <Notice tone="hold" title="The judgements cannot be worked out yet">
              {liveAttr.problem}.
            </Notice>
          )}
        </div>
      )}

      {problem && (
        <Notice tone="bad" title="Not recorded" live="alert">
          {problem}
        </Notice>
      )}
      <div className="flex flex-wrap items-end justify-end gap-3">
        {kind === 'variable' && (
          <div className="w-64">
            <Labelled label="Method on record">
              {(id) => (
                <Select
                  id={id}
                  value={method}
                  onChange={(e) => setMethod(e.target.value as 'range' | 'anova')}
                  options={[
                    { value: 'anova', label: 'ANOVA' },
                    { value: 'range', label: 'Average and range' },
                  ]}
                />
              )}
            </Labelled>
          </div>
        )}
        <Button type="submit" variant="primary" size="lg" disabled={record.isPending}>
          Record the study
        </Button>
      </div>
    </form>
  );
}
