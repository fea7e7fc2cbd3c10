import { lazy, Suspense, useEffect, useRef, useState } from 'react';
import type { StationFormJson } from '../../api/station/types';
import { Button } from '../../components/ui/button';
import { Icon } from '../../components/ui/icon';
import { known, language, useT } from '../../lib/i18n';
import { NcrNumber } from './ncr-number';

// the dialog validates with the shared zod schema: loaded once a supervisor is offered the button
const loadReentryDialog = () => import('./reentry-dialog');
const ReentryDialog = lazy(() => loadReentryDialog().then((m) => ({ default: m.ReentryDialog })));

type Blocked = Extract<StationFormJson['sequence'], { ok: false }>;

// the titles' words: sequence.<code> in the locale files

/**
 * A re-entry sends a part back through a stage it has been through; it is never a way to jump a
 * part ahead of the stages it still owes.
 */
function reentryFits(form: StationFormJson, sequence: Blocked) {
  if (sequence.code === 'finished') return true;
  if (sequence.code !== 'out_of_sequence') return false;
  return form.item.route.find((s) => s.code === form.stage.code)?.state === 'done';
}

type SequenceAlertProps = {
  form: StationFormJson;
  canAllowReentry: boolean;
  canReadNcr: boolean;
  onReentry: () => void;
};

/** Why this part cannot be recorded here now, in plain words, and what can be done about it. */
export function SequenceAlert({ form, canAllowReentry, canReadNcr, onReentry }: SequenceAlertProps) {
  const [open, setOpen] = useState(false);
  const t = useT();
  const sequence = form.sequence;
  const ref = useRef<HTMLDivElement>(null);
  // on a tablet the refusal may sit below the part's card: bring it into view
  useEffect(() => {
    if (!form.sequence.ok) ref.current?.scrollIntoView({ block: 'center' });
  }, [form.sequence.ok, form.item.serial]);
  const fits = !sequence.ok && reentryFits(form, sequence);
  // fetched while the supervisor reads the alert, so the dialog opens at once on a tap
  useEffect(() => {
    if (fits && canAllowReentry) void loadReentryDialog();
  }, [fits, canAllowReentry]);
  if (sequence.ok) return null;
  const held = sequence.code === 'on_hold';
  return (
    <>
      <div
        ref={ref}
        role="alert"
        className={`flex items-start gap-4 rounded-card border-l-8 border-2 bg-card px-5 py-4 ${held ? 'border-hold' : 'border-bad'}`}
      >
        <span className={`mt-1 ${held ? 'text-hold' : 'text-bad'}`}>
          <Icon name={held ? 'hold' : 'alert'} size={40} />
        </span>
        <div className="flex min-w-0 flex-col gap-3">
          <h2 className={`text-3xl font-bold ${held ? 'text-hold' : 'text-bad'}`}>{t(`sequence.${sequence.code}`)}</h2>
          {/* the server's sentence names the stages; on a Spanish screen its plain Spanish, by the same code */}
          <p className="text-xl">
            {(language() !== 'en' && known(`sequence.${sequence.code}.body`)) || sequence.message}
          </p>
          {sequence.expectedStage && (
            <p className="text-xl">
              {t('sequence.nextStage')} <span className="font-semibold">{sequence.expectedStage.name}</span>
            </p>
          )}
          {form.holds.length > 0 && (
            <div>
              <p className="text-lg font-semibold">{t('sequence.openNcrs')}</p>
              <ul className="mt-1 flex flex-col gap-1.5">
                {form.holds.map((h) => (
                  <li key={h.number} className="text-lg">
                    <NcrNumber number={h.number} link={canReadNcr} />{' '}
                    <span className="text-ink-soft">({h.state.replace(/_/g, ' ')})</span>
                    <span className="block text-base text-ink-soft">{h.description}</span>
                  </li>
                ))}
              </ul>
            </div>
          )}
          {fits &&
            (canAllowReentry ? (
              <div>
                <Button variant="primary" size="lg" onClick={() => setOpen(true)}>
                  {t('sequence.allowReentry')}
                </Button>
              </div>
            ) : (
              <p className="flex items-start gap-2 text-lg">
                <Icon name="info" size={22} className="mt-0.5 text-accent" />
                {t('sequence.askSupervisor', { stage: form.stage.name })}
              </p>
            ))}
        </div>
      </div>
      {open && (
        <Suspense fallback={null}>
          <ReentryDialog
            form={form}
            onClose={() => setOpen(false)}
            onDone={() => {
              setOpen(false);
              onReentry();
            }}
          />
        </Suspense>
      )}
    </>
  );
}
