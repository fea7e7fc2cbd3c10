import { PART_KIND_LABELS } from '../../../shared/schemas/reference.js';
import type { SequenceCheck } from '../../../shared/schemas/results.js';
import { onlyOptionalBetween, stepIndex } from '../../../shared/domain/route.js';
import type { Item, Stage, StageReentry } from '../../models/index.js';
import type { Route } from './common.js';

/**
 * Whether this stage may be recorded for the item now. A part is recorded at its current stage,
 * or further on when every stage in between is optional; going back needs a supervisor's re-entry.
 */
export function checkSequence(
  item: Item,
  stage: Stage,
  route: Route | null,
  holds: { number: string }[],
  reentry: StageReentry | null,
): SequenceCheck {
  const what = PART_KIND_LABELS[item.kind].toLowerCase();
  const fail = (
    code: Exclude<SequenceCheck['code'], 'ready' | 'reentry'>,
    message: string,
    expected: Stage | null = null,
  ): SequenceCheck => ({
    ok: false,
    code,
    message,
    expectedStage: expected ? { code: expected.code, name: expected.name } : null,
  });
  if (item.kind !== stage.partKind) {
    return fail(
      'wrong_part',
      `${item.serial} is a ${what}; ${stage.name} is recorded for ${PART_KIND_LABELS[stage.partKind].toLowerCase()}s.`,
    );
  }
  if (item.status === 'scrapped') return fail('scrapped', `${item.serial} has been scrapped and cannot be recorded.`);
  if (holds.length) {
    return fail(
      'on_hold',
      `${item.serial} is on hold: ${holds.map((h) => h.number).join(', ')} ${holds.length > 1 ? 'are' : 'is'} open. Quality must decide it before this part is recorded again.`,
    );
  }
  const steps = route?.steps ?? [];
  const at = stepIndex(steps, stage.id);
  if (at < 0) return fail('not_on_route', `${stage.name} is not on the route of ${item.serial}.`);
  if (reentry && reentry.stageId === stage.id) {
    return { ok: true, code: 'reentry', message: `Re-entry allowed by a supervisor: ${reentry.reason}` };
  }
  const current = stepIndex(steps, item.currentStageId);
  if (['finished', 'installed', 'released', 'shipped'].includes(item.status) || current < 0) {
    return fail(
      'finished',
      `${item.serial} has finished its route. A supervisor can allow a re-entry of ${stage.name} with a reason.`,
    );
  }
  if (at === current) return { ok: true, code: 'ready', message: `${item.serial} is due at ${stage.name}.` };
  const next = steps[current]!.stage;
  if (at > current && onlyOptionalBetween(steps, current, at)) {
    return { ok: true, code: 'ready', message: `${item.serial} is due at ${stage.name} (optional stages skipped).` };
  }
  if (at < current) {
    return fail(
      'out_of_sequence',
      `${item.serial} has already passed ${stage.name}; its next stage is ${next.name}. A supervisor can allow a re-entry with a reason.`,
      next,
    );
  }
  return fail(
    'out_of_sequence',
    `${item.serial} is not ready for ${stage.name}: its next stage is ${next.name}.`,
    next,
  );
}
