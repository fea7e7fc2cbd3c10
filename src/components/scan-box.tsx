import { useQueryClient } from '@tanstack/react-query';
import { lazy, Suspense, useId, useRef, useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router';
import { parseSerial } from '../../shared/domain/serial';
import { useSignedIn } from '../api/auth/me';
import { itemQueryOptions, useItem } from '../api/items/item';
import type { ItemJson } from '../api/items/types';
import { ApiError } from '../lib/http';
import { serialHref } from '../lib/paths';
import { ItemSummary } from './item-summary';
import { Button } from './ui/button';
import { Dialog } from './ui/dialog';
import { Icon } from './ui/icon';
import { Notice } from './ui/notice';
import { useT } from '../lib/i18n';
import { localizeText } from '../lib/server-messages';

// the decoder and its camera code load only when someone taps "Scan with camera"
const CameraScan = lazy(() => import('./camera-scan').then((m) => ({ default: m.CameraScan })));

const compact = (s: string) => s.toUpperCase().replace(/[\s\-–—_.]/g, '');
const FULL_LENGTH = 10;

type ScanBoxProps = {
  /** Called with the item once a well-formed serial has been found on the server. */
  onItem: (item: ItemJson) => void;
  /**
   * How the server is asked about a checked serial; the item lookup unless a page has one request
   * that answers for the item as well (the station's form), so a scan costs one round trip.
   */
  lookup?: (serial: string) => Promise<ItemJson>;
  /** Show what was found under the box (pages that move on at once can leave it off). */
  preview?: boolean;
  autoFocus?: boolean;
  hint?: string;
  /** A serial to start with, e.g. the one a page was opened for. */
  initial?: string;
};

/**
 * The one way to find an item: typed, scanned by a hand scanner (which types the characters and
 * presses Enter) or read by the camera. The check character is verified as the serial is typed, so
 * a slip is caught at the dock, and a serial that cannot exist is never sent to the server.
 */
export function ScanBox({ onItem, lookup, preview = true, autoFocus = false, hint, initial = '' }: ScanBoxProps) {
  const id = useId();
  const t = useT();
  const input = useRef<HTMLInputElement>(null);
  const queryClient = useQueryClient();
  const [text, setText] = useState(initial);
  const [tried, setTried] = useState(false);
  const [looking, setLooking] = useState<string | null>(null);
  const [found, setFound] = useState<string | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  // a serial no item has is "not found"; anything else (no network, a refusal) is said as it is
  const [missing, setMissing] = useState(true);
  const [camera, setCamera] = useState(false);
  const shown = useItem(preview ? found : null);

  const check = parseSerial(text);
  const complete = compact(text).length >= FULL_LENGTH;
  const reason = !check.ok && text.trim() !== '' && (complete || tried) ? check.reason : null;

  const find = async (raw: string) => {
    const parsed = parseSerial(raw);
    setTried(true);
    if (!parsed.ok) {
      input.current?.focus();
      return;
    }
    if (looking === parsed.serial) return;
    setText(parsed.serial);
    setLooking(parsed.serial);
    setFailure(null);
    try {
      const item = await (lookup ? lookup(parsed.serial) : queryClient.fetchQuery(itemQueryOptions(parsed.serial)));
      setFound(item.serial);
      onItem(item);
    } catch (err) {
      setFound(null);
      setMissing(err instanceof ApiError ? err.status === 404 : false);
      setFailure(
        err instanceof ApiError && err.status === 404
          ? t('scan.noSuchSerial', { serial: parsed.serial })
          : err instanceof ApiError
            ? err.message
            : t('scan.lookupFailed'),
      );
      input.current?.select();
    } finally {
      setLooking(null);
    }
  };

  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    void find(text);
  };

  const statusId = `${id}-status`;
  return (
    <div className="flex flex-col gap-4">
      <form
        role="search"
        aria-label={t('scan.findItem')}
        onSubmit={onSubmit}
        noValidate
        className="flex flex-col gap-2"
      >
        <label htmlFor={`${id}-serial`} className="text-base font-semibold text-ink">
          {t('scan.serial')}
        </label>
        <div className="flex flex-wrap items-center gap-2">
          <input
            ref={input}
            id={`${id}-serial`}
            value={text}
            onChange={(e) => {
              setText(e.target.value);
              setTried(false);
              setFailure(null);
            }}
            autoFocus={autoFocus}
            autoComplete="off"
            autoCapitalize="characters"
            spellCheck={false}
            enterKeyHint="search"
            placeholder="BK-7KX4-P2MK"
            aria-invalid={reason || failure ? true : undefined}
            aria-describedby={statusId}
            className="h-16 min-w-0 flex-1 basis-72 rounded-control border-2 border-ink bg-field px-4 font-mono text-[1.75rem] font-semibold uppercase tracking-wider text-ink placeholder:font-normal placeholder:text-ink-faint aria-[invalid=true]:border-bad"
          />
          <Button type="submit" variant="primary" size="lg" disabled={looking !== null} aria-busy={looking !== null}>
            <span className="px-2 text-lg">{t('scan.find')}</span>
          </Button>
          <Button size="lg" icon="camera" onClick={() => setCamera(true)}>
            {t('scan.withCamera')}
          </Button>
        </div>
        <div id={statusId} aria-live="polite" className="min-h-7 text-base">
          {reason ? (
            <p className="flex items-start gap-1.5 font-medium text-bad">
              <Icon name="bad" size={20} className="mt-0.5" />
              {localizeText(reason)}
            </p>
          ) : check.ok ? (
            <p className="flex items-start gap-1.5 font-medium text-ok">
              <Icon name="ok" size={20} className="mt-0.5" />
              {looking ? t('scan.looking', { serial: check.serial }) : t('scan.readOk', { serial: check.serial })}
            </p>
          ) : (
            <p className="text-ink-soft">{hint ?? t('scan.hint')}</p>
          )}
        </div>
      </form>
      {failure && (
        <Notice tone="bad" live="alert" title={missing ? t('scan.notFound') : t('scan.notOpened')}>
          {failure}
        </Notice>
      )}
      {preview && shown.data && !failure && shown.data.serial === found && <ItemSummary item={shown.data} />}
      <Dialog open={camera} onClose={() => setCamera(false)} title={t('scan.cameraTitle')} width="wide">
        <Suspense fallback={<p className="text-ink-soft">{t('scan.cameraLoading')}</p>}>
          <CameraScan
            onCode={(code) => {
              setCamera(false);
              setText(code);
              void find(code);
            }}
          />
        </Suspense>
      </Dialog>
    </div>
  );
}

/** Opens what was scanned: a core's receipt (for those who read intake) or the item page. */
export function useOpenItem() {
  const me = useSignedIn();
  const navigate = useNavigate();
  return (item: ItemJson) => navigate(serialHref(item.serial, item.kind, me?.can('intake.read') ?? false));
}
