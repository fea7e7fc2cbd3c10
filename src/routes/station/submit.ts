import type { RecordResultBody } from '../../api/station/record-result';
import type { GaugeChoice } from '../../api/station/types';
import { ApiError } from '../../lib/http';
import { t as tr } from '../../lib/i18n';
import { readingName, type Judged, type Slot, type SlotValue } from './readings';

/** What the tablet sends for one form, apart from the key, part and station. */
export type Draft = {
  slots: SlotValue[];
  gauge: string;
  /** One per measured characteristic, in form order: its own gauge, or '' for the same as \`gauge\`. */
  gauges: string[];
  notes: string;
  photoIds: number[];
  /** The size class chosen per characteristic code that has classes; '' when not chosen. */
  sizeClasses: Record<string, string>;
};

/**
 * A note for the summary at the top: which box, in words, and where to take the operator. A
 * missing reading is not written at its box (the empty box says so itself once a submit was tried).
 */
export type Problem = { key: string; label: string; message: string; missing?: boolean };

export const whereKey = (slotKey: string) => `${slotKey}#where`;

/** An optional characteristic's box left empty: not recorded at all, rather than sent blank. */
function leftOut(s: Slot, judged: Judged, v: SlotValue | undefined): boolean {
  if (!s.char.optional) return false;
  if (s.char.kind === 'attribute') return (v?.choice ?? '') === '';
  return judged.typed[s.index]?.state === 'empty';
}

/** The slots whose readings are sent, in the order they are sent (the server's notes point at that order). */
export const sentSlots = (slots: Slot[], judged: Judged, values: SlotValue[]) =>
  slots.filter((s) => !leftOut(s, judged, values[s.index]));

/**
 * Only typed characteristics go out (never derived ones), and of optional ones only what was
 * filled in; a pass/fail carries where it failed.
 */
export function readingsOf(slots: Slot[], judged: Judged, values: SlotValue[]): RecordResultBody['readings'] {
  return sentSlots(slots, judged, values).map((s) => {
    const v = values[s.index];
    if (s.char.kind === 'attribute') {
      const where = v?.where.trim() ?? '';
      return {
        characteristic: s.char.code,
        position: s.position.code,
        passed: v?.choice === 'pass',
        ...(v?.choice === 'fail' && where ? { location: where } : {}),
      };
    }
    const t = judged.typed[s.index];
    // typed in another unit: sent as typed, with its unit; the server converts it the same way
    if (t?.state === 'number' && t.entered) {
      return { characteristic: s.char.code, position: s.position.code, value: t.entered.value, unit: t.entered.unit };
    }
    return {
      characteristic: s.char.code,
      position: s.position.code,
      value: t?.state === 'number' ? t.value : Number.NaN,
      ...(s.char.unit ? { unit: s.char.unit } : {}),
    };
  });
}

/** Everything the server would refuse that the tablet can see for itself, before anything is sent. */
export function problemsBeforeSending(
  slots: Slot[],
  judged: Judged,
  draft: Draft,
  needsGauge: boolean,
  gauges: GaugeChoice[],
): Problem[] {
  const out: Problem[] = [];
  for (const s of judged.unreadable) {
    const t = judged.typed[s.index];
    out.push({
      key: s.key,
      label: readingName(s.char, s.position),
      message: t?.state === 'impossible' ? tr('problem.impossible') : tr('problem.notNumber'),
    });
  }
  for (const s of judged.missing) {
    out.push({
      key: s.key,
      label: readingName(s.char, s.position),
      message: s.char.kind === 'attribute' ? tr('problem.passOrFail') : tr('problem.missing'),
      missing: true,
    });
  }
  for (const s of slots) {
    const v = draft.slots[s.index];
    if (s.char.kind === 'attribute' && s.char.critical && v?.choice === 'fail' && !v.where.trim()) {
      out.push({ key: whereKey(s.key), label: tr('form.where', { name: s.char.name }), message: tr('problem.where') });
    }
  }
  if (needsGauge) {
    const g = gauges.find((x) => x.code === draft.gauge);
    if (!g) out.push({ key: 'gauge', label: tr('form.gaugeUsed'), message: tr('problem.gauge') });
    else if (!g.usable) out.push({ key: 'gauge', label: tr('form.gaugeUsed'), message: g.why });
  }
  if (draft.notes.trim().length > 2000)
    out.push({ key: 'notes', label: tr('form.notes'), message: tr('problem.notes') });
  return out;
}

/** The summary's lines: one per characteristic for its missing readings, each note on its own. */
export function summaryLines(problems: Problem[], slots: Slot[]): Problem[] {
  const out: Problem[] = [];
  const missingBy = new Map<string, Problem[]>();
  for (const p of problems) {
    if (!p.missing) {
      out.push(p);
      continue;
    }
    const code = p.key.split('@')[0]!;
    missingBy.set(code, [...(missingBy.get(code) ?? []), p]);
  }
  for (const [code, ps] of missingBy) {
    if (ps.length === 1) {
      out.push(ps[0]!);
      continue;
    }
    const name = slots.find((s) => s.char.code === code)?.char.name ?? code;
    out.push({
      key: ps[0]!.key,
      label: name,
      message: tr('problem.missingFrom', { count: ps.length, from: ps[0]!.label.slice(name.length + 2) }),
    });
  }
  return out;
}

/** The server's notes, keyed by the box they belong to (`characteristic@position`, `gauge`, zod paths). */
export function serverProblems(err: ApiError, slots: Slot[], sent: Slot[]): Problem[] {
  const byKey = new Map(slots.map((s) => [s.key, s]));
  return Object.entries(err.fields).map(([field, message]) => {
    const path = /^readings\.(\d+)\.(\w+)$/.exec(field);
    if (path) {
      const s = sent[Number(path[1])];
      if (s) {
        const key = path[2] === 'location' ? whereKey(s.key) : s.key;
        return { key, label: readingName(s.char, s.position), message };
      }
    }
    const s = byKey.get(field);
    if (s) return { key: s.key, label: readingName(s.char, s.position), message };
    if (field === 'gauge') return { key: 'gauge', label: 'Gauge used', message };
    const own = /^gauges\.(.+)$/.exec(field);
    if (own) {
      const name = slots.find((x) => x.char.code === own[1])?.char.name ?? own[1]!;
      return { key: field, label: `Gauge for ${name}`, message };
    }
    if (field === 'notes') return { key: 'notes', label: 'Notes', message };
    if (field === 'badge' || field === 'pin') return { key: field, label: field === 'pin' ? 'PIN' : 'Badge', message };
    if (field.startsWith('photoIds')) return { key: 'photos', label: 'Photos', message };
    return { key: field, label: field, message };
  });
}

/** Why nothing was recorded, in words an operator can act on. */
export type Refusal = {
  title: string;
  message: string;
  /** The answer depends on the part's state now: offer to load its form again. */
  reload: boolean;
  /** A retry with the same key is safe and wanted. */
  retry: boolean;
};

export function refusalOf(err: unknown): Refusal {
  if (!(err instanceof ApiError)) {
    return {
      title: 'Not recorded yet',
      message: 'Something went wrong in this browser. Press Record result again; it will not be stored twice.',
      reload: false,
      retry: true,
    };
  }
  if (err.status === 0 || err.status >= 500) {
    const why = err.status === 0 ? 'Coretrail could not reach the server.' : err.message;
    return {
      title: 'Not recorded yet',
      message: `${why} Check the connection, then press Record result again: the same result is sent, so it is never stored twice.`,
      reload: false,
      retry: true,
    };
  }
  if (err.status === 409) {
    const reason = typeof err.details.reason === 'string' ? err.details.reason : '';
    const titles: Record<string, string> = {
      already_recorded: 'Already recorded',
      on_hold: 'On hold',
      out_of_sequence: 'Not due here',
      finished: 'Route finished',
      wrong_part: 'Wrong part for this station',
      scrapped: 'Scrapped',
      no_rule: 'No approved rule',
    };
    return { title: titles[reason] ?? 'Not recorded', message: err.message, reload: true, retry: false };
  }
  if (err.status === 422) return { title: 'Not recorded', message: err.message, reload: true, retry: false };
  return { title: 'Not recorded', message: err.message, reload: false, retry: false };
}
