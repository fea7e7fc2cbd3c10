import type { EvaluatedReading, FormCharacteristic } from '../../../shared/domain/evaluate';
import { Dialog } from '../../components/ui/dialog';
import { Icon } from '../../components/ui/icon';
import { t } from '../../lib/i18n';
import { formatValue } from './numbers';

const MAX_SHOWN = 6;

/** Why a reading fails, in the screen's language, from its limits (the evaluator's own words are English). */
function reasonOf(r: EvaluatedReading, c: FormCharacteristic | undefined) {
  const unit = c?.unit ? ` ${c.unit}` : '';
  const n = (v: number) => `${formatValue(v, c?.rule?.resolution)}${unit}`;
  if (r.rounded !== null && r.lower !== null && r.rounded < r.lower)
    return t('confirm.below', { value: n(r.rounded), lower: n(r.lower) });
  if (r.rounded !== null && r.upper !== null && r.rounded > r.upper)
    return t('confirm.above', { value: n(r.rounded), upper: n(r.upper) });
  return r.passed === false ? t('confirm.checkFailed') : r.reason;
}

function line(r: EvaluatedReading, chars: FormCharacteristic[]) {
  const c = chars.find((x) => x.code === r.characteristic);
  const where = c?.positions.find((p) => p.code === r.position)?.label;
  const shown = r.rounded ?? r.value;
  const value =
    shown !== null
      ? `${formatValue(shown, c?.rule?.resolution)}${c?.unit ? ` ${c.unit}` : ''}`
      : r.passed === false
        ? t('form.fail')
        : '';
  return { name: `${c?.name ?? r.characteristic}${where ? ` · ${where}` : ''}`, value, reason: reasonOf(r, c) };
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
      title={t('confirm.title', { count: failing.length })}
      description={t('confirm.description')}
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
      {failing.length > shown.length && (
        <p className="mt-2">{t('form.andMore', { count: failing.length - shown.length })}</p>
      )}
      <div className="mt-5 flex flex-wrap items-center justify-end gap-3 border-t border-rule pt-4">
        <button
          type="button"
          autoFocus
          onClick={onCorrect}
          className="inline-flex h-14 items-center justify-center gap-2 rounded-control border-2 border-ink bg-card px-6 text-lg font-semibold text-ink hover:bg-sunk"
        >
          {t('confirm.correct')}
        </button>
        <button
          type="button"
          onClick={onRecord}
          className="inline-flex h-14 items-center justify-center gap-2 rounded-control border border-accent-strong bg-accent px-6 text-lg font-semibold text-white hover:bg-accent-strong"
        >
          <Icon name="bad" size={22} />
          {t('confirm.record')}
        </button>
      </div>
    </Dialog>
  );
}
