import { useState, type ClipboardEvent, type KeyboardEvent } from 'react';
import { Icon } from '../../components/ui/icon';

/**
 * The study's entry grids, laid out as the study is run: one row per part, one column per trial
 * of each appraiser. Enter goes down the column (an appraiser measures every part once, then
 * the next trial); a block pasted from a spreadsheet fills rightwards and downwards from the cell.
 */

export const APPRAISER_NAMES = ['A', 'B', 'C', 'D', 'E'];

export type VariableCells = string[][][]; // [appraiser][part][trial]
export type Rating = 'pass' | 'fail' | '';
export type RatingCells = Rating[][][];

export function emptyCells<T>(appraisers: number, parts: number, trials: number, blank: T): T[][][] {
  return Array.from({ length: appraisers }, () =>
    Array.from({ length: parts }, () => Array.from({ length: trials }, () => blank)),
  );
}

/** Keeps what was entered when the grid's size changes. */
export function resize<T>(cells: T[][][], appraisers: number, parts: number, trials: number, blank: T): T[][][] {
  return Array.from({ length: appraisers }, (_, a) =>
    Array.from({ length: parts }, (_, p) => Array.from({ length: trials }, (_, t) => cells[a]?.[p]?.[t] ?? blank)),
  );
}

const cellId = (grid: string, a: number, p: number, t: number) => `${grid}-${a}-${p}-${t}`;
const focusCell = (grid: string, a: number, p: number, t: number) =>
  document.getElementById(cellId(grid, a, p, t))?.focus();

export const isReading = (s: string) => s.trim() !== '' && Number.isFinite(Number(s.trim()));

function GridHead({ appraisers, trials }: { appraisers: number; trials: number }) {
  return (
    <thead className="sticky top-0 bg-card">
      <tr>
        <th rowSpan={2} scope="col" className="border-b border-rule px-2 py-1 text-left text-sm">
          Part
        </th>
        {Array.from({ length: appraisers }, (_, a) => (
          <th
            key={a}
            colSpan={trials}
            scope="colgroup"
            className="border-b border-l-2 border-rule-strong px-2 py-1 text-center text-sm"
          >
            Appraiser {APPRAISER_NAMES[a]}
          </th>
        ))}
      </tr>
      <tr>
        {Array.from({ length: appraisers }, (_, a) =>
          Array.from({ length: trials }, (_, t) => (
            <th
              key={`${a}-${t}`}
              scope="col"
              className={`border-b border-rule px-1 py-1 text-center text-xs font-medium text-ink-soft ${t === 0 ? 'border-l-2 border-l-rule-strong' : ''}`}
            >
              Trial {t + 1}
            </th>
          )),
        )}
      </tr>
    </thead>
  );
}

export function VariableGrid({
  cells,
  onChange,
  unit,
}: {
  cells: VariableCells;
  onChange: (next: VariableCells) => void;
  unit: string;
}) {
  const appraisers = cells.length;
  const parts = cells[0]?.length ?? 0;
  const trials = cells[0]?.[0]?.length ?? 0;
  const set = (a: number, p: number, t: number, v: string) =>
    onChange(
      cells.map((byPart, i) =>
        byPart.map((byTrial, j) => byTrial.map((x, k) => (i === a && j === p && k === t ? v : x))),
      ),
    );

  const [leftOut, setLeftOut] = useState(0);
  const onKey = (e: KeyboardEvent<HTMLInputElement>, a: number, p: number, t: number) => {
    if (e.key !== 'Enter') return;
    e.preventDefault();
    if (p + 1 < parts) focusCell('var', a, p + 1, t);
    else if (t + 1 < trials) focusCell('var', a, 0, t + 1);
    else if (a + 1 < appraisers) focusCell('var', a + 1, 0, 0);
  };

  // a pasted block: rows are parts, columns run across trials and then appraisers, as on screen
  const onPaste = (e: ClipboardEvent<HTMLInputElement>, a: number, p: number, t: number) => {
    const text = e.clipboardData.getData('text');
    if (!/[\t\n]/.test(text.trim())) return;
    e.preventDefault();
    // only the trailing line break goes: a leading tab is an empty first cell, not padding
    const rows = text
      .replace(/(\r?\n)+$/, '')
      .split(/\r?\n/)
      // tabs only: a comma may be a decimal comma, and splitting on it would change the readings
      .map((r) => r.split('\t'));
    const next = cells.map((byPart) => byPart.map((byTrial) => [...byTrial]));
    let outside = 0;
    rows.forEach((row, dr) => {
      row.forEach((value, dc) => {
        const col = a * trials + t + dc;
        const pa = Math.floor(col / trials);
        const tr = col % trials;
        const pp = p + dr;
        if (pa < appraisers && pp < parts) next[pa]![pp]![tr] = value.trim();
        else outside += 1;
      });
    });
    setLeftOut(outside);
    onChange(next);
  };

  return (
    <div className="flex flex-col gap-2">
      {leftOut > 0 && (
        <p role="status" className="font-semibold text-hold">
          {leftOut} pasted value{leftOut === 1 ? '' : 's'} fell outside the grid and {leftOut === 1 ? 'was' : 'were'}{' '}
          left out: add parts, appraisers or trials first, then paste again.
        </p>
      )}
      <div className="overflow-x-auto rounded-control border border-rule">
        <table className="w-full border-collapse">
          <caption className="sr-only">
            Readings in {unit}: one row per part, one column per trial of each appraiser
          </caption>
          <GridHead appraisers={appraisers} trials={trials} />
          <tbody>
            {Array.from({ length: parts }, (_, p) => (
              <tr key={p} className="odd:bg-sunk/40">
                <th scope="row" className="px-2 text-left font-mono text-sm">
                  {p + 1}
                </th>
                {Array.from({ length: appraisers }, (_, a) =>
                  Array.from({ length: trials }, (_, t) => {
                    const v = cells[a]![p]![t]!;
                    const bad = v.trim() !== '' && !isReading(v);
                    return (
                      <td key={`${a}-${t}`} className={`p-1 ${t === 0 ? 'border-l-2 border-l-rule-strong' : ''}`}>
                        <input
                          id={cellId('var', a, p, t)}
                          aria-label={`Appraiser ${APPRAISER_NAMES[a]}, part ${p + 1}, trial ${t + 1}`}
                          aria-invalid={bad || undefined}
                          inputMode="decimal"
                          enterKeyHint="next"
                          autoComplete="off"
                          value={v}
                          onChange={(e) => set(a, p, t, e.target.value)}
                          onKeyDown={(e) => onKey(e, a, p, t)}
                          onPaste={(e) => onPaste(e, a, p, t)}
                          className="h-9 w-full min-w-[4.75rem] rounded-control border border-rule-strong bg-field px-1.5 text-right font-mono tabular-nums aria-[invalid=true]:border-2 aria-[invalid=true]:border-bad floor:h-12 floor:text-base"
                        />
                      </td>
                    );
                  }),
                )}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

const NEXT: Record<Rating, Rating> = { '': 'pass', pass: 'fail', fail: 'pass' };

/** One judgement: tap to set pass, tap again for fail. Word, colour and shape, never colour alone. */
function RatingButton({ value, label, onClick }: { value: Rating; label: string; onClick: () => void }) {
  const look =
    value === 'pass'
      ? 'border-ok bg-ok-tint text-ok'
      : value === 'fail'
        ? 'border-[3px] border-double border-bad bg-bad-tint text-bad'
        : 'border-dashed border-rule-strong bg-field text-ink-soft';
  return (
    <button
      type="button"
      aria-label={`${label}: ${value || 'not judged'}`}
      onClick={onClick}
      className={`inline-flex h-9 w-full min-w-[4.5rem] items-center justify-center gap-1 rounded-control border text-sm font-medium floor:h-12 floor:text-base ${look}`}
    >
      {value && <Icon name={value === 'pass' ? 'ok' : 'bad'} size={16} />}
      {value === 'pass' ? 'Pass' : value === 'fail' ? 'Fail' : '—'}
    </button>
  );
}

export function RatingGrid({
  cells,
  reference,
  onChange,
  onReference,
}: {
  cells: RatingCells;
  reference: Rating[] | null;
  onChange: (next: RatingCells) => void;
  onReference: (next: Rating[]) => void;
}) {
  const appraisers = cells.length;
  const parts = cells[0]?.length ?? 0;
  const trials = cells[0]?.[0]?.length ?? 0;
  const flip = (a: number, p: number, t: number) =>
    onChange(
      cells.map((byPart, i) =>
        byPart.map((byTrial, j) => byTrial.map((x, k) => (i === a && j === p && k === t ? NEXT[x] : x))),
      ),
    );
  return (
    <div className="overflow-x-auto rounded-control border border-rule">
      <table className="w-full border-collapse">
        <caption className="sr-only">Judgements: one row per part, one column per trial of each appraiser</caption>
        <GridHead appraisers={appraisers} trials={trials} />
        <tbody>
          {Array.from({ length: parts }, (_, p) => (
            <tr key={p} className="odd:bg-sunk/40">
              <th scope="row" className="px-2 text-left font-mono text-sm">
                {p + 1}
                {reference && (
                  <span className="ml-2 inline-block min-w-[5.5rem] align-middle">
                    <RatingButton
                      value={reference[p] ?? ''}
                      label={`Reference, part ${p + 1}`}
                      onClick={() => onReference(reference.map((r, i) => (i === p ? NEXT[r] : r)))}
                    />
                  </span>
                )}
              </th>
              {Array.from({ length: appraisers }, (_, a) =>
                Array.from({ length: trials }, (_, t) => (
                  <td key={`${a}-${t}`} className={`p-1 ${t === 0 ? 'border-l-2 border-l-rule-strong' : ''}`}>
                    <RatingButton
                      value={cells[a]![p]![t]!}
                      label={`Appraiser ${APPRAISER_NAMES[a]}, part ${p + 1}, trial ${t + 1}`}
                      onClick={() => flip(a, p, t)}
                    />
                  </td>
                )),
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
