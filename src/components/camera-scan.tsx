import { useEffect, useRef, useState } from 'react';
import type { Html5Qrcode } from 'html5-qrcode';
import { Notice } from './ui/notice';

type Problem = { title: string; text: string };

/** html5-qrcode reports getUserMedia failures as text that still carries the DOMException's name. */
function explain(err: unknown): Problem {
  const text = String(err instanceof Error ? `${err.name} ${err.message}` : err);
  if (/NotAllowed|Permission|denied/i.test(text)) {
    return {
      title: 'The camera was not allowed',
      text: 'Coretrail asked for the camera and the browser said no. Allow the camera for this site in the browser settings, or type the serial or use the hand scanner.',
    };
  }
  if (/NotFound|DevicesNotFound|Overconstrained|Requested device not found/i.test(text)) {
    return {
      title: 'No camera found',
      text: 'This device has no camera Coretrail can use. Type the serial or use the hand scanner.',
    };
  }
  if (/NotReadable|TrackStart|in use/i.test(text)) {
    return {
      title: 'The camera is busy',
      text: 'Another app or tab is using the camera. Close it and try again, or type the serial.',
    };
  }
  return { title: 'The camera could not start', text: 'Type the serial or use the hand scanner instead.' };
}

// getUserMedia exists only on https or on this machine; a tablet on a plain http address has none
const cameraApiMissing = (): Problem | null =>
  typeof navigator.mediaDevices?.getUserMedia === 'function'
    ? null
    : {
        title: 'No camera on this connection',
        text: 'Browsers only lend the camera to secure (https) addresses. Type the serial or use the hand scanner.',
      };

type CameraScanProps = { onCode: (text: string) => void };

/**
 * Mounted only while the camera panel is open: asks for the camera when it mounts and always lets
 * go of it when it unmounts (closed, or a code read). The decoder is fetched on first use, so the
 * pages that never open the camera never download it.
 */
export function CameraScan({ onCode }: CameraScanProps) {
  const host = useRef<HTMLDivElement>(null);
  const [problem, setProblem] = useState<Problem | null>(cameraApiMissing);
  const [starting, setStarting] = useState(true);
  const onCodeRef = useRef(onCode);
  useEffect(() => {
    onCodeRef.current = onCode;
  });

  useEffect(() => {
    if (cameraApiMissing()) return;
    let closed = false;
    let scanner: Html5Qrcode | null = null;
    let running: Promise<unknown> = Promise.resolve();
    // each run gets its own element, so a stopping scanner never clears a starting one's video
    const el = document.createElement('div');
    el.id = `camera-${Math.random().toString(36).slice(2)}`;
    host.current?.append(el);

    const stop = async () => {
      await running.catch(() => undefined);
      if (scanner?.isScanning) await scanner.stop().catch(() => undefined);
      el.remove();
    };

    running = import('html5-qrcode').then(async ({ Html5Qrcode, Html5QrcodeSupportedFormats }) => {
      if (closed) return;
      scanner = new Html5Qrcode(el.id, { formatsToSupport: [Html5QrcodeSupportedFormats.QR_CODE], verbose: false });
      try {
        await scanner.start(
          { facingMode: 'environment' },
          // the whole frame is read, not a box in it: a label held close or off-centre still reads
          { fps: 10 },
          (text) => {
            if (closed) return;
            closed = true;
            void stop();
            onCodeRef.current(text);
          },
          undefined,
        );
        if (!closed) setStarting(false);
      } catch (err) {
        if (!closed) {
          setProblem(explain(err));
          setStarting(false);
        }
      }
    });
    running.catch((err: unknown) => {
      if (!closed) setProblem(explain(err));
    });

    return () => {
      closed = true;
      void stop();
    };
  }, []);

  return (
    <div className="flex flex-col gap-3">
      {problem ? (
        <Notice tone="bad" live="alert" title={problem.title}>
          {problem.text}
        </Notice>
      ) : (
        <p role="status" className="text-ink-soft">
          {starting ? 'Starting the camera…' : 'Point the camera at the label. It is read by itself.'}
        </p>
      )}
      <div
        ref={host}
        className={`overflow-hidden rounded-control bg-ink ${problem ? 'hidden' : 'min-h-60'}`}
        aria-label="Camera view"
        role="img"
      />
    </div>
  );
}
