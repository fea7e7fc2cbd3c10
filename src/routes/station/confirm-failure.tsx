import type { EvaluatedReading, FormCharacteristic } from '../../../shared/domain/evaluate';
import { Dialog } from '../../components/ui/dialog';
import { Icon } from '../../components/ui/icon';
import { plural } from '../../lib/format';

const MAX_SHOWN = 6;

function line(r: EvaluatedReading, chars: FormCharacteristic[]) {
  const c = chars.find((x) => x.code === r.characteristic);
  const where = c?.positions.find((p) => p.code === r.position)?.label;
  const value =
    r.value !== null ? `${r.rounded ?? r.value}${c?.unit ? ` ${c.unit}` : ''}` : r.passed === false ? 'Fail' : '';
  return { name: `${c?.name ?? r.characteristic}${where ? ` · ${where}` : ''}`, value, reason: r.reason };
}

/**
 * A result that fails opens an NCR and holds the part, so the form asks once before recording it:
 * what failed, in large type, and the choice to put a typing slip right first.
 */
export function ConfirmFailure({
  open,
  failing,
  characteristics,
  onCorrect,
  onRecord,
}: {
  open: boolean;
  failing: EvaluatedReading[];
  characteristics: FormCharacteristic[];
  onCorrect: () => void;
  onRecord: () => void;
}) {
  const shown = failing.slice(0, MAX_SHOWN).map((r) => line(r, characteristics));
  return (
    <Dialog
      open={open}
      onClose={onCorrect}
      width="wide"
      title={`${plural(failing.length, 'reading')} out of tolerance`}
      description="Recording this result opens an NCR and puts the part on hold. Check each value against the part first."
    >
      <ul className="flex flex-col gap-2">
        {shown.map((l) => (
          <li
            key={l.name}
            className="flex items-start gap-3 rounded-control border-[3px] border-double border-bad bg-bad-tint px-3 py-2"
          >
            <Icon name="bad" size={26} className="mt-1 shrink-0 text-bad" />
            <div>
              <p className="text-xl font-semibold">
                {l.name}: <span className="font-mono">{l.value}</span>
              </p>
              <p className="text-base">{l.reason}</p>
            </div>
          </li>
        ))}
      </ul>
      {failing.length > shown.length && <p className="mt-2">and {failing.length - shown.length} more.</p>}
      <div className="mt-5 flex flex-wrap items-center justify-end gap-3 border-t border-rule pt-4">
        <button
          type="button"
          autoFocus
          onClick={onCorrect}
          className="inline-flex h-14 items-center justify-center gap-2 rounded-control border-2 border-ink bg-card px-6 text-lg font-semibold text-ink hover:bg-sunk"
        >
          Correct a reading
        </button>
        <button
          type="button"
          onClick={onRecord}
          className="inline-flex h-14 items-center justify-center gap-2 rounded-control border border-accent-strong bg-accent px-6 text-lg font-semibold text-white hover:bg-accent-strong"
        >
          <Icon name="bad" size={22} />
          Record the failure
        </button>
      </div>
    </Dialog>
  );
}
