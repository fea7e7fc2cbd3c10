import { useId, useMemo, useRef, useState, type KeyboardEvent, type RefObject } from 'react';
import { FormProvider, useForm, useWatch } from 'react-hook-form';
import { SUBMIT_RETRIES, useRecordResult } from '../../api/station/record-result';
import { useSetUnitPreference, useUnitPreferences } from '../../api/station/unit-preferences';
import type { StationFormJson } from '../../api/station/types';
import { PhotoField } from '../../components/photo-field';
import { Button } from '../../components/ui/button';
import { Card, CardBody } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { ApiError } from '../../lib/http';
import { enqueue, flushQueue, mustQueue, type Queued } from '../../lib/offline-queue';
import { inTabletMode, setTabletIdentity, tabletIdentity } from '../../lib/tablet-mode';
import { useSignedIn } from '../../api/auth/me';
import { useT } from '../../lib/i18n';
import { localizeHazard } from '../../lib/server-messages';
import {
  CharGaugeField,
  charGaugeKey,
  charGaugeProblems,
  choicesAfterMainChange,
  gaugesToSend,
  measuredOf,
  startingChoices,
} from './char-gauges';
import { bigControl, bigLabel } from './controls';
import { FormStateContext, type FormState } from './form-state';
import { GaugeField, preselectedGauge } from './gauge-field';
import { sectionsOf } from './layout';
import { ReadingSection } from './reading-section';
import { entryUnitOf, judge, slotsOf, type EntryUnits } from './readings';
import { RunTestImport } from './run-test-import';
import {
  SizeClassField,
  sizeClassKey,
  sizeClassProblems,
  sizeClassesToSend,
  withSizeClasses,
} from './size-class-field';
import { useFirstReading } from './use-first-reading';
import { useInView } from './use-in-view';
import type { RecordedResult } from './verdict-panel';
import { ConfirmFailure } from './confirm-failure';
import { ProblemSummary, Tally } from './form-summary';
import {
  problemsBeforeSending,
  readingsOf,
  refusalOf,
  sentSlots,
  serverProblems,
  summaryLines,
  type Draft,
  type Problem,
  type Refusal,
} from './submit';

// what the sticky bar covers of the window, about: a caution under it is as good as scrolled away
const BAR_HEIGHT = 96;

/** "Rotating cutters and hones. Guards closed, …" → "Rotating cutters and hones." */
const firstSentence = (text: string) => /^.*?[.!?](?=\s|$)/.exec(text)?.[0] ?? text;

type ReadingFormProps = {
  form: StationFormJson;
  /** Made when this form was opened; kept for every retry of it, so a retry never records twice. */
  idempotencyKey: string;
  startedAt: string;
  canRecord: boolean;
  onRecorded: (result: RecordedResult) => void;
  /** No network: the result waits on the tablet, to be sent when the network is back. */
  onQueued: (entry: Queued) => void;
  onReload: () => void;
  /** The stage's safety caution above the form: while it is scrolled away, the bar repeats it in short. */
  cautionRef?: RefObject<HTMLElement | null>;
};

/** The whole form for one part at one station: readings laid out like the part, gauge, notes, photos. */
export function ReadingForm({
  form,
  idempotencyKey,
  startedAt,
  canRecord,
  onRecorded,
  onQueued,
  onReload,
  cautionRef,
}: ReadingFormProps) {
  const me = useSignedIn();
  const t = useT();
  const notesId = useId();
  const slots = useMemo(() => slotsOf(form.characteristics), [form.characteristics]);
  const sections = useMemo(() => sectionsOf(form.characteristics, slots), [form.characteristics, slots]);
  const measured = useMemo(() => measuredOf(form.characteristics), [form.characteristics]);
  const firstMeasured = measured[0] ?? null;
  const needsGauge = firstMeasured !== null;
  const mainGauge = preselectedGauge(form.gauges, firstMeasured?.code ?? null);
  const methods = useForm<Draft>({
    defaultValues: {
      slots: slots.map(() => ({ text: '', choice: '', where: '' })),
      gauge: mainGauge,
      gauges: startingChoices(measured, form.gauges, mainGauge),
      notes: '',
      photoIds: [],
      sizeClasses: {},
    },
  });
  const values = useWatch({ control: methods.control, name: 'slots' });
  const chosenClasses = useWatch({ control: methods.control, name: 'sizeClasses' });
  // a chosen size class's limits stand in for the rule's own, here as on the server
  const chars = useMemo(
    () => withSizeClasses(form.characteristics, chosenClasses ?? {}),
    [form.characteristics, chosenClasses],
  );
  const preferred = useUnitPreferences().data?.preferences;
  const remember = useSetUnitPreference();
  const [chosenUnits, setChosenUnits] = useState<EntryUnits>({});
  // a shared tablet's operator is known only at submit: its readings start in the rules' own units
  const system = inTabletMode() ? undefined : me?.user.unitSystem;
  const units = useMemo(() => {
    const out: EntryUnits = {};
    for (const c of form.characteristics) {
      const u = entryUnitOf(c, chosenUnits, preferred ?? {}, system);
      if (u) out[c.code] = u;
    }
    return out;
  }, [form.characteristics, chosenUnits, preferred, system]);
  const judged = useMemo(() => judge(chars, slots, values, units), [chars, slots, values, units]);
  const [problems, setProblems] = useState<Problem[]>([]);
  const [attempted, setAttempted] = useState(false);
  const [summaryTitle, setSummaryTitle] = useState('');
  const [refusal, setRefusal] = useState<Refusal | null>(null);
  // a failing result is asked about once before it is sent: the draft waiting for the answer
  const [toConfirm, setToConfirm] = useState<Draft | null>(null);
  const record = useRecordResult();
  const topRef = useRef<HTMLDivElement>(null);
  const submitRef = useRef<HTMLButtonElement>(null);
  const rootRef = useRef<HTMLFormElement>(null);
  const barRef = useRef<HTMLDivElement>(null);

  const problemMap = useMemo(
    () => Object.fromEntries(problems.filter((p) => !p.missing).map((p) => [p.key, p.message])),
    [problems],
  );
  const state: FormState = {
    judged,
    values,
    problems: problemMap,
    attempted,
    clearProblem: (key) => setProblems((ps) => (ps.some((p) => p.key === key) ? ps.filter((p) => p.key !== key) : ps)),
    units,
    setUnit: (code, unit) => {
      const char = form.characteristics.find((c) => c.code === code);
      if (!char?.unit) return;
      setChosenUnits((u) => ({ ...u, [code]: unit }));
      // remembered for this person's next form; a failure to remember changes nothing on this one
      remember.mutate({ unit: char.unit, enteredUnit: unit === char.unit ? null : unit });
    },
  };
  const unruled = form.characteristics.filter((c) => c.kind !== 'attribute' && !c.rule);

  const showTop = () => requestAnimationFrame(() => topRef.current?.focus());

  useFirstReading(rootRef, barRef);
  const cautionInView = useInView(cautionRef, BAR_HEIGHT);

  const goTo = (key: string) => {
    const el = rootRef.current?.querySelector<HTMLElement>(`[data-key="${CSS.escape(key)}"]`);
    el?.focus();
    el?.scrollIntoView({ block: 'center' });
  };

  const send = async (draft: Draft, confirmed = false) => {
    setAttempted(true);
    setRefusal(null);
    const now = judge(withSizeClasses(form.characteristics, draft.sizeClasses), slots, draft.slots, units);
    const local = [
      ...problemsBeforeSending(slots, now, draft, needsGauge, form.gauges),
      ...charGaugeProblems(measured, form.gauges, draft),
      ...sizeClassProblems(measured, draft.sizeClasses, (c) =>
        slots.some((sl) => sl.char.code === c.code && now.typed[sl.index]?.state !== 'empty'),
      ),
    ];
    if (local.length) {
      setProblems(local);
      const unread = local.filter((p) => !p.missing).length;
      const missing = local.length - unread;
      setSummaryTitle(
        t('record.notYet', {
          what: [missing && t('record.toEnter', { count: missing }), unread && t('record.toFix', { count: unread })]
            .filter(Boolean)
            .join(` ${t('common.and')} `),
        }),
      );
      showTop();
      return;
    }
    if (now.failing.length && !confirmed) {
      setToConfirm(draft);
      return;
    }
    setToConfirm(null);
    const readings = readingsOf(slots, now, draft.slots);
    // a gauge is named only for what was measured with it: none for an optional reading left empty
    const entered = new Set(readings.map((r) => r.characteristic));
    const own = Object.fromEntries(
      Object.entries(needsGauge ? gaugesToSend(measured, form.gauges, draft.gauge, draft.gauges) : {}).filter(([c]) =>
        entered.has(c),
      ),
    );
    const body = {
      idempotencyKey,
      serial: form.item.serial,
      station: form.station.code,
      gauge: needsGauge ? draft.gauge : null,
      ...(Object.keys(own).length ? { gauges: own } : {}),
      startedAt,
      // the moment of recording on this tablet: a result that waits for the network keeps it
      takenAt: new Date().toISOString(),
      notes: draft.notes.trim(),
      readings,
      photoIds: draft.photoIds,
      sizeClasses: sizeClassesToSend(draft.sizeClasses),
    };
    // no network, or results already waiting: this one waits too, behind them, judged by the tablet meanwhile
    const queue = async () => {
      const who = inTabletMode() ? tabletIdentity() : null;
      if (inTabletMode() && !who) return false;
      const entry: Queued = {
        key: idempotencyKey,
        queuedAt: body.takenAt,
        path: who ? '/api/tablet/results' : '/api/results',
        body,
        stageName: form.stage.name,
        shown: now.failing.length ? 'fail' : 'pass',
        ...(who ? { badge: who.badge } : {}),
        ...(!who && me ? { person: { id: me.user.id, name: me.user.name } } : {}),
      };
      await enqueue(entry, who?.pin);
      if (who) setTabletIdentity(null);
      setProblems([]);
      onQueued(entry);
      void flushQueue();
      return true;
    };
    if (mustQueue() && (await queue())) return;
    try {
      const result = await record.mutateAsync(body);
      setProblems([]);
      onRecorded({
        ...result,
        otherGauges: measured.filter((c) => own[c.code]).map((c) => ({ name: c.name, gauge: own[c.code]! })),
      });
    } catch (err) {
      if (err instanceof ApiError && err.status === 0 && (await queue())) return;
      if (err instanceof ApiError && err.status === 400) {
        const fromServer = serverProblems(err, slots, sentSlots(slots, now, draft.slots));
        setProblems(fromServer);
        setSummaryTitle(err.message);
        if (!fromServer.length) setRefusal(refusalOf(err));
      } else {
        setProblems([]);
        setRefusal(refusalOf(err));
      }
      showTop();
    }
  };

  // Enter moves on to the next box, as a hand scanner or a gloved thumb expects; it never submits
  const onKeyDown = (e: KeyboardEvent<HTMLFormElement>) => {
    if (e.key !== 'Enter' || !(e.target instanceof HTMLInputElement) || e.target.type === 'file') return;
    e.preventDefault();
    const current = e.target;
    const seen = new Set<string>();
    const stops = [...e.currentTarget.querySelectorAll<HTMLElement>('[data-field]')].filter((el) => {
      if (!(el instanceof HTMLInputElement) || el.type !== 'radio') return true;
      if (seen.has(el.name)) return false;
      seen.add(el.name);
      return true;
    });
    const at = stops.findIndex((el) =>
      current.type === 'radio' && el instanceof HTMLInputElement ? el.name === current.name : el === current,
    );
    const next = stops[at + 1];
    if (next) next.focus();
    else submitRef.current?.focus();
  };

  const submitting = record.isPending;
  // while the station sends the same result again by itself (503 or no answer), say so
  const progress = !submitting
    ? ''
    : record.failureCount > 0
      ? t('record.retrying', { n: record.failureCount + 1, of: SUBMIT_RETRIES + 1 })
      : t('record.recording');
  return (
    <FormProvider {...methods}>
      <FormStateContext.Provider value={state}>
        <form
          ref={rootRef}
          noValidate
          onSubmit={(e) => void methods.handleSubmit((d) => send(d))(e)}
          onKeyDown={onKeyDown}
          aria-label={t('form.label', { stage: form.stage.name, serial: form.item.serial })}
          className="flex flex-col gap-5"
        >
          <div ref={topRef} tabIndex={-1} className="flex flex-col gap-3 outline-none empty:hidden">
            {problems.length > 0 && (
              <ProblemSummary title={summaryTitle} problems={summaryLines(problems, slots)} onGo={goTo} />
            )}
            {refusal && (
              <Notice tone={refusal.retry ? 'hold' : 'bad'} live="alert" title={refusal.title}>
                <p className="text-base">{refusal.message}</p>
                {refusal.reload && (
                  <div className="mt-2">
                    <Button size="lg" onClick={onReload}>
                      {t('record.loadAgain')}
                    </Button>
                  </div>
                )}
              </Notice>
            )}
          </div>
          {unruled.length > 0 && (
            <Notice tone="hold" title={t('record.noRuleTitle')}>
              {t('record.noRule', { names: unruled.map((c) => c.name.toLowerCase()).join(', ') })}
            </Notice>
          )}
          {form.stage.runTest && (
            <RunTestImport serial={form.item.serial} slots={slots} characteristics={form.characteristics} />
          )}
          {needsGauge && (
            <Card as="div">
              <CardBody>
                <GaugeField
                  gauges={form.gauges}
                  unit={firstMeasured.unit}
                  first={firstMeasured.code}
                  problem={problemMap.gauge}
                  onChange={() => {
                    state.clearProblem('gauge');
                    const { gauge, gauges } = methods.getValues();
                    methods.setValue('gauges', choicesAfterMainChange(measured, form.gauges, gauge, gauges));
                  }}
                />
              </CardBody>
            </Card>
          )}
          {sections.map((s) => (
            <ReadingSection
              key={s.char.code}
              section={s}
              slots={slots}
              gauge={
                needsGauge && s.char.kind === 'variable' ? (
                  <>
                    <SizeClassField
                      char={s.char}
                      problem={problemMap[sizeClassKey(s.char)]}
                      onChange={() => state.clearProblem(sizeClassKey(s.char))}
                    />
                    <CharGaugeField
                      char={s.char}
                      index={measured.indexOf(s.char)}
                      gauges={form.gauges}
                      problem={problemMap[charGaugeKey(s.char)]}
                      onChange={() => state.clearProblem(charGaugeKey(s.char))}
                    />
                  </>
                ) : null
              }
            />
          ))}
          <Card as="div">
            <CardBody>
              <div className="flex flex-col gap-5">
                <div className="flex flex-col gap-1.5">
                  <label htmlFor={notesId} className={bigLabel}>
                    {t('form.notes')}
                  </label>
                  <textarea
                    id={notesId}
                    maxLength={2000}
                    data-key="notes"
                    aria-invalid={problemMap.notes ? true : undefined}
                    className={`${bigControl} min-h-28 py-2`}
                    {...methods.register('notes', { onChange: () => state.clearProblem('notes') })}
                  />
                  {problemMap.notes && <p className="font-semibold text-bad">{problemMap.notes}</p>}
                </div>
                <PhotoField name="photoIds" label={t('form.photos')} max={10} hint={t('form.photosHint')} />
              </div>
            </CardBody>
          </Card>
          <div
            ref={barRef}
            className="sticky bottom-0 z-10 flex flex-wrap items-center justify-between gap-x-6 gap-y-3 rounded-t-card border-2 border-b-0 border-ink bg-card px-5 py-3 shadow-[0_-4px_12px_rgba(29,33,36,0.12)]"
          >
            {cautionRef && !cautionInView && form.stage.hazard && (
              <p className="flex w-full items-center gap-2 text-base font-semibold text-hold">
                <Icon name="alert" size={20} />
                <span>
                  {t('caution.short', {
                    stage: form.stage.name,
                    hazard: firstSentence(localizeHazard(form.stage.hazard)),
                  })}
                </span>
              </p>
            )}
            <Tally judged={judged} />
            <div className="flex flex-wrap items-center gap-3">
              {!canRecord && <p className="text-base text-ink-soft">Your role can see this form but not record it.</p>}
              <p role="status" className="text-base text-ink-soft empty:hidden">
                {progress}
              </p>
              <button
                ref={submitRef}
                type="submit"
                disabled={submitting || !canRecord}
                aria-busy={submitting}
                className="inline-flex h-14 min-w-48 items-center justify-center gap-2 rounded-control border border-accent-strong bg-accent px-6 text-xl font-semibold text-white hover:bg-accent-strong disabled:cursor-not-allowed disabled:opacity-55"
              >
                <Icon name="ok" size={22} />
                {t('form.record')}
              </button>
            </div>
          </div>
        </form>
        <ConfirmFailure
          open={toConfirm !== null}
          failing={judged.failing}
          characteristics={form.characteristics}
          onCorrect={() => {
            setToConfirm(null);
            const first = judged.failing[0];
            if (first) requestAnimationFrame(() => goTo(`${first.characteristic}@${first.position}`));
          }}
          onRecord={() => toConfirm && void send(toConfirm, true)}
        />
      </FormStateContext.Provider>
    </FormProvider>
  );
}
