import { useQueryClient } from '@tanstack/react-query';
import { lazy, Suspense, useId, useState, type KeyboardEvent } from 'react';
import { useController } from 'react-hook-form';
import { Link } from 'react-router';
import { parseSerial } from '../../../shared/domain/serial';
import { itemQueryOptions, useItem } from '../../api/items/item';
import type { ItemJson } from '../../api/items/types';
import { StatusBadge } from '../../components/item-status';
import { Button } from '../../components/ui/button';
import { Dialog } from '../../components/ui/dialog';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { ApiError } from '../../lib/http';
import { t, useT } from '../../lib/i18n';
import { partName } from '../../lib/item-status';
import { itemHref } from '../../lib/paths';
import { label, localizeText } from '../../lib/server-messages';
import { messagesFor, RefusalLines, slotKeys, useRefusals } from './refusals';
import { concernsFor, routeDone, type Slot } from './slots';

const CameraScan = lazy(() => import('../../components/camera-scan').then((m) => ({ default: m.CameraScan })));

/** Scan order on the sheet: after a part is found, the next empty slot takes the cursor. */
function focusNextEmpty(from: HTMLInputElement | null) {
  const all = [...document.querySelectorAll<HTMLInputElement>('[data-slot-input]')];
  const after = all.slice(all.indexOf(from!) + 1).find((el) => el.value.trim() === '');
  after?.focus();
}

function routeLine(item: ItemJson): string {
  const steps = item.route;
  const done = steps.filter((s) => s.state === 'done').length;
  const all = steps.length;
  if (all === 0) return t('slot.noRoute');
  if (routeDone(item)) return t('slot.routeDone', { done, all });
  return item.currentStage
    ? t('slot.dueAtCount', { stage: item.currentStage.name, done, all })
    : t('slot.doneCount', { done, all });
}

function ScannedPart({
  item,
  slot,
  familyCode,
  elsewhere,
  onEmpty,
}: SlotProps & { item: ItemJson; onEmpty: () => void }) {
  useT();
  const concerns = concernsFor(item, slot, familyCode, elsewhere);
  return (
    <div className="flex flex-col gap-2 rounded-control border border-rule bg-sunk px-3 py-2.5">
      <div className="flex items-start justify-between gap-2">
        <div className="flex min-w-0 flex-wrap items-center gap-x-3 gap-y-1 pt-2">
          <Link
            to={itemHref(item.serial)}
            className="inline-flex min-h-11 items-center font-mono text-lg font-semibold text-accent underline-offset-4 hover:underline floor:min-h-12"
          >
            {item.serial}
          </Link>
          <StatusBadge status={item.status} />
          <span>{partName(label(item.kindLabel), item.positionLabel)}</span>
          <span className="font-mono text-sm font-semibold">{item.family.code}</span>
        </div>
        <Button variant="quiet" onClick={onEmpty} aria-label={t('slot.emptyLabel', { slot: label(slot.label) })}>
          {t('slot.empty')}
        </Button>
      </div>
      <p className="text-sm text-ink-soft">{routeLine(item)}</p>
      {concerns.length > 0 ? (
        <Notice tone={concerns.every((c) => c.tone === 'hold') ? 'hold' : 'bad'} title={t('slot.cannotGoIn')}>
          <ul className="flex flex-col gap-0.5">
            {concerns.map((c) => (
              <li key={c.text}>{c.text}</li>
            ))}
          </ul>
        </Notice>
      ) : (
        <p className="flex items-center gap-1.5 text-sm font-medium text-ok">
          <Icon name="ok" size={18} />
          {t('slot.ready')}
        </p>
      )}
    </div>
  );
}

type SlotProps = {
  slot: Slot;
  familyCode: string;
  /** The label of another slot that already holds this serial, if any. */
  elsewhere: string | null;
};

/**
 * One part slot on the build sheet: the serial is typed, scanned by a hand scanner (characters,
 * then Enter) or read by the camera; once found on the server it fills the slot and the next
 * empty slot takes the cursor. The slot holds only a serial the server has found.
 */
export function PartSlot({ slot, familyCode, elsewhere }: SlotProps) {
  const id = useId();
  useT();
  const inputId = `${id}-serial`;
  const slotName = label(slot.label);
  const queryClient = useQueryClient();
  const {
    field: { ref: fieldRef, name, value: raw, onChange: setValue },
    fieldState,
    // not marked touched on blur: the cursor moves into the next slot by itself, which is no reason to call it missing
  } = useController({ name: slot.name, defaultValue: '' });
  const value = typeof raw === 'string' ? raw : '';
  const [text, setText] = useState(value);
  const [tried, setTried] = useState(false);
  const [looking, setLooking] = useState<string | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const [camera, setCamera] = useState(false);
  const { refusal, clear } = useRefusals();
  const refused = messagesFor(refusal, slotKeys(slot));
  const item = useItem(value || null);

  const check = parseSerial(text);
  const reason =
    !check.ok && text.trim() !== '' && (tried || text.replace(/[\s-]/g, '').length >= 10) ? check.reason : null;

  const find = async (raw: string, input: HTMLInputElement | null) => {
    const parsed = parseSerial(raw);
    setTried(true);
    if (!parsed.ok || looking === parsed.serial) return;
    if (parsed.serial === value) {
      setText(parsed.serial);
      return;
    }
    setLooking(parsed.serial);
    setFailure(null);
    try {
      const found = await queryClient.fetchQuery(itemQueryOptions(parsed.serial));
      setText(found.serial);
      setValue(found.serial);
      clear(slotKeys(slot));
      focusNextEmpty(input);
    } catch (err) {
      setFailure(
        err instanceof ApiError && err.status === 404
          ? t('slot.noSuchSerial', { serial: parsed.serial })
          : err instanceof ApiError
            ? err.message
            : t('scan.lookupFailed'),
      );
    } finally {
      setLooking(null);
    }
  };

  const onKeyDown = (e: KeyboardEvent<HTMLInputElement>) => {
    // Enter finds the part; it must not send the whole build sheet
    if (e.key !== 'Enter') return;
    e.preventDefault();
    void find(text, e.currentTarget);
  };

  const empty = () => {
    setText('');
    setTried(false);
    setFailure(null);
    setValue('');
    clear(slotKeys(slot));
    document.getElementById(inputId)?.focus();
  };

  const statusId = `${id}-status`;
  const problemId = `${id}-problem`;
  const error = fieldState.error?.message && localizeText(fieldState.error.message);
  const bad = Boolean(reason || failure || error || refused.length);

  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={inputId} className="text-base font-semibold text-ink">
        {slotName}
      </label>
      <div className="flex flex-wrap items-center gap-2">
        <input
          ref={fieldRef}
          id={inputId}
          name={name}
          data-slot-input=""
          value={text}
          onChange={(e) => {
            const next = e.target.value;
            setText(next);
            setTried(false);
            setFailure(null);
            const parsed = parseSerial(next);
            // a changed serial empties the slot until the new one is found
            if (value && !parsed.ok) setValue('');
            if (parsed.ok && parsed.serial !== value) void find(next, e.target);
          }}
          onKeyDown={onKeyDown}
          autoComplete="off"
          autoCapitalize="characters"
          spellCheck={false}
          enterKeyHint="next"
          placeholder={t('slot.placeholder')}
          aria-invalid={bad ? true : undefined}
          aria-describedby={`${statusId} ${problemId}`}
          className="h-12 min-w-0 flex-1 basis-56 rounded-control border-2 border-rule-strong bg-field px-3 font-mono text-xl font-semibold uppercase tracking-wide text-ink placeholder:font-sans placeholder:text-base placeholder:font-normal placeholder:normal-case placeholder:tracking-normal placeholder:text-ink-faint hover:border-ink-soft aria-[invalid=true]:border-bad"
        />
        <Button
          size="lg"
          onClick={(e) => void find(text, e.currentTarget.parentElement?.querySelector('input') ?? null)}
          disabled={looking !== null}
          aria-busy={looking !== null}
          aria-label={t('slot.findLabel', { slot: slotName.toLowerCase() })}
        >
          {t('scan.find')}
        </Button>
        <Button
          size="lg"
          icon="camera"
          onClick={() => setCamera(true)}
          aria-label={t('slot.cameraLabel', { slot: slotName.toLowerCase() })}
        >
          <span className="hidden sm:inline">{t('slot.camera')}</span>
        </Button>
      </div>
      <div id={statusId} aria-live="polite" className={value ? 'text-sm' : 'min-h-6 text-sm'}>
        {reason ? (
          <p className="flex items-start gap-1.5 font-medium text-bad">
            <Icon name="bad" size={18} className="mt-0.5" />
            {localizeText(reason)}
          </p>
        ) : looking ? (
          <p className="text-ink-soft">{t('scan.looking', { serial: looking })}</p>
        ) : failure ? (
          <p className="flex items-start gap-1.5 font-medium text-bad">
            <Icon name="bad" size={18} className="mt-0.5" />
            {failure}
          </p>
        ) : !value ? (
          <p className="text-ink-soft">{t('slot.hint')}</p>
        ) : null}
      </div>
      <div id={problemId} className="flex flex-col gap-2 empty:hidden">
        {error && !reason && !failure && (
          <p className="flex items-start gap-1.5 font-medium text-bad">
            <Icon name="bad" size={18} className="mt-0.5" />
            {error}
          </p>
        )}
        <RefusalLines messages={refused} />
      </div>
      {item.data && item.data.serial === value && (
        <ScannedPart item={item.data} slot={slot} familyCode={familyCode} elsewhere={elsewhere} onEmpty={empty} />
      )}
      <Dialog
        open={camera}
        onClose={() => setCamera(false)}
        title={t('slot.cameraTitle', { slot: slotName.toLowerCase() })}
        width="wide"
      >
        <Suspense fallback={<p className="text-ink-soft">{t('scan.cameraLoading')}</p>}>
          <CameraScan
            onCode={(code) => {
              setCamera(false);
              setText(code);
              void find(code, document.getElementById(inputId) as HTMLInputElement | null);
            }}
          />
        </Suspense>
      </Dialog>
    </div>
  );
}
