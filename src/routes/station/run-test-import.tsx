import { useId, useState } from 'react';
import { useFormContext } from 'react-hook-form';
import { useParseRunTestCsv } from '../../api/station/run-test-parse';
import type { FormCharacteristic } from '../../api/station/types';
import { Button } from '../../components/ui/button';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { ApiError } from '../../lib/http';
import { plural } from '../../lib/format';
import { bigLabel } from './controls';
import { useFormState } from './form-state';
import { judge, type Slot } from './readings';
import { emptyLines, planFill, replaces, unusedName } from './run-test-fill';
import type { Draft } from './submit';

type Outcome =
  | {
      kind: 'filled';
      file: string;
      filled: number;
      replaced: number;
      failing: number;
      empty: ReturnType<typeof emptyLines>;
      unused: string[];
    }
  | { kind: 'refused'; title: string; message: string };

type RunTestImportProps = { serial: string; slots: Slot[]; characteristics: FormCharacteristic[] };

/**
 * The run-test stand's CSV export, read into the form: its readings fill the boxes and are judged
 * live like typed ones. A file that does not read cleanly changes nothing; the operator still
 * checks the readings and records the result.
 */
export function RunTestImport({ serial, slots, characteristics }: RunTestImportProps) {
  const id = useId();
  const { getValues, setValue } = useFormContext<Draft>();
  const { clearProblem, units } = useFormState();
  const parse = useParseRunTestCsv();
  const [file, setFile] = useState<File | null>(null);
  const [outcome, setOutcome] = useState<Outcome | null>(null);

  const read = async () => {
    if (!file) {
      setOutcome({ kind: 'refused', title: 'No file chosen', message: 'Choose the test stand’s CSV export first.' });
      return;
    }
    setOutcome(null);
    let csv: string;
    try {
      csv = await file.text();
    } catch {
      setOutcome({
        kind: 'refused',
        title: 'The file could not be opened',
        message: 'This tablet could not read the file. Choose it again, or export it from the stand again.',
      });
      return;
    }
    let readings;
    try {
      ({ readings } = await parse.mutateAsync({ serial, csv }));
    } catch (err) {
      const message =
        err instanceof ApiError ? (err.code === 'invalid_csv' ? err.message : (err.fields.csv ?? err.message)) : '';
      setOutcome({
        kind: 'refused',
        title: `${file.name} was not used; nothing in the form changed`,
        message: message || 'Something went wrong in this browser. Try again.',
      });
      return;
    }
    const before = getValues('slots');
    const plan = planFill(slots, readings, units);
    let replaced = 0;
    for (const f of plan.fills) {
      if (replaces(f, before[f.slot.index])) replaced++;
      const opts = { shouldDirty: true };
      if (f.slot.char.kind === 'attribute') setValue(`slots.${f.slot.index}.choice`, f.choice, opts);
      else setValue(`slots.${f.slot.index}.text`, f.text, opts);
      clearProblem(f.slot.key);
    }
    const after = getValues('slots');
    const judged = judge(characteristics, slots, after, units);
    const empty = slots.filter((s) =>
      s.char.kind === 'attribute' ? !after[s.index]?.choice : judged.typed[s.index]?.state === 'empty',
    );
    setOutcome({
      kind: 'filled',
      file: file.name,
      filled: plan.fills.length,
      replaced,
      failing: judged.failing.length,
      empty: emptyLines(empty),
      unused: plan.unused.map((u) => `${unusedName(u.reading)}: ${u.why}`),
    });
  };

  const reading = parse.isPending;
  return (
    <section aria-labelledby={`${id}-heading`} className="rounded-card border border-rule bg-card shadow-card">
      <header className="flex flex-col gap-1 border-b border-rule px-5 py-3">
        <h3 id={`${id}-heading`} className="text-xl font-semibold">
          Test stand export
        </h3>
        <p className="text-ink-soft">
          Read the stand’s CSV file to fill the readings below. Check them, then record the result as usual.
        </p>
      </header>
      <div className="flex flex-col gap-4 px-5 py-4">
        <div className="flex flex-col gap-1.5">
          <label htmlFor={id} className={bigLabel}>
            Test stand CSV
          </label>
          <div className="flex flex-wrap items-center gap-3">
            <input
              id={id}
              type="file"
              accept=".csv,text/csv"
              aria-describedby={`${id}-hint`}
              onChange={(e) => {
                setFile(e.target.files?.[0] ?? null);
                setOutcome(null);
              }}
              className="block min-h-14 max-w-full rounded-control border-2 border-rule-strong bg-field text-lg text-ink file:mr-3 file:min-h-14 file:cursor-pointer file:border-0 file:border-r-2 file:border-rule-strong file:bg-sunk file:px-4 file:text-lg file:font-medium file:text-ink hover:file:bg-ground-deep/40"
            />
            <Button size="lg" onClick={() => void read()} disabled={reading} aria-busy={reading}>
              Read the file
            </Button>
          </div>
          <p id={`${id}-hint`} className="text-base text-ink-soft">
            One line per reading, headed <span className="font-mono">channel,cylinder,value,unit</span>.
          </p>
        </div>
        <div role="status" className="empty:hidden">
          {reading ? (
            <p className="text-lg text-ink-soft">Reading {file?.name}…</p>
          ) : outcome?.kind === 'filled' ? (
            <FilledNote outcome={outcome} />
          ) : null}
        </div>
        {outcome?.kind === 'refused' && (
          <Notice tone="bad" live="alert" title={outcome.title}>
            <p className="text-base">{outcome.message}</p>
          </Notice>
        )}
      </div>
    </section>
  );
}

function FilledNote({ outcome }: { outcome: Extract<Outcome, { kind: 'filled' }> }) {
  const required = outcome.empty.filter((l) => !l.optional);
  const optional = outcome.empty.filter((l) => l.optional);
  return (
    <Notice
      tone={required.length ? 'hold' : 'ok'}
      title={`${plural(outcome.filled, 'reading')} filled from ${outcome.file}${
        outcome.replaced ? ` (${outcome.replaced} replaced what was typed before)` : ''
      }`}
    >
      <div className="flex flex-col gap-1.5 text-base">
        {required.length ? (
          <div>
            <p className="font-semibold">Still empty, to enter by hand:</p>
            <ul className="list-disc pl-5">
              {required.map((l) => (
                <li key={l.code}>{l.text}</li>
              ))}
            </ul>
          </div>
        ) : (
          <p>Every reading the form needs is filled.</p>
        )}
        {optional.length > 0 && (
          <p>Optional and still empty: {optional.map((l) => l.text).join('; ')}. Left empty, they are not recorded.</p>
        )}
        {outcome.unused.length > 0 && <p>Not used: {outcome.unused.join('; ')}.</p>}
        {outcome.failing > 0 && (
          <p className="flex items-start gap-1.5 font-semibold text-bad">
            <Icon name="bad" size={18} className="mt-0.5 shrink-0" />
            {plural(outcome.failing, 'reading')} out of tolerance, marked below.
          </p>
        )}
        <p>Check the readings, then press Record result.</p>
      </div>
    </Notice>
  );
}
