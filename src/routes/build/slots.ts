import type { EngineFamily, PartKind } from '../../../shared/schemas/reference';
import type { ItemJson } from '../../api/items/types';
import { t } from '../../lib/i18n';
import { label } from '../../lib/server-messages';

/** One place on the build sheet a manufactured part is scanned into. */
export type Slot = {
  /** The form field the serial goes into, which is also the key of the server's refusal for it. */
  name: 'block' | 'crankshaft' | `heads.${number}`;
  label: string;
  kind: PartKind;
  /** For the two heads of a V engine: which side this slot takes. */
  side: 'left' | 'right' | null;
};

export function slotsFor(family: Pick<EngineFamily, 'headsPerEngine'> | undefined): Slot[] {
  const heads: Slot[] =
    family?.headsPerEngine === 2
      ? [
          { name: 'heads.0', label: 'Left head', kind: 'cylinder_head', side: 'left' },
          { name: 'heads.1', label: 'Right head', kind: 'cylinder_head', side: 'right' },
        ]
      : [{ name: 'heads.0', label: 'Cylinder head', kind: 'cylinder_head', side: null }];
  return [
    { name: 'block', label: 'Block', kind: 'block', side: null },
    { name: 'crankshaft', label: 'Crankshaft', kind: 'crankshaft', side: null },
    ...heads,
  ];
}

/** Every required stage of its route is behind it (what the server checks before a part may go in). */
export const routeDone = (item: ItemJson) =>
  item.status === 'finished' ||
  (item.status === 'in_process' &&
    !item.route.some((s) => s.required && (s.state === 'todo' || s.state === 'current')));

export type Concern = { tone: 'bad' | 'hold'; text: string };

/**
 * What is plainly wrong with a scanned part before anything is sent: the wrong kind, another
 * family, scrapped, installed, on hold, not finished, the wrong side. The server checks again and
 * has the last word (it also sees holds this page cannot).
 */
export function concernsFor(item: ItemJson, slot: Slot, familyCode: string, elsewhere: string | null): Concern[] {
  const kind = label(item.kindLabel).toLowerCase();
  const wanted = label(slot.kind === 'cylinder_head' ? 'Cylinder head' : slot.label).toLowerCase();
  const serial = item.serial;
  if (item.kind !== slot.kind) {
    return [{ tone: 'bad', text: t('slot.wrongKind', { serial, kind, wanted }) }];
  }
  const out: Concern[] = [];
  if (elsewhere) out.push({ tone: 'bad', text: t('slot.twice', { serial, slot: label(elsewhere).toLowerCase() }) });
  if (familyCode && item.family.code !== familyCode) {
    out.push({
      tone: 'bad',
      text: t('slot.otherFamily', { serial, family: item.family.code, wanted: familyCode }),
    });
  }
  if (item.status === 'scrapped') out.push({ tone: 'bad', text: t('slot.scrapped', { serial }) });
  else if (item.status === 'installed') out.push({ tone: 'bad', text: t('slot.installed', { serial }) });
  else if (item.status === 'on_hold') {
    out.push({ tone: 'hold', text: t('slot.onHold', { serial }) });
  } else if (!routeDone(item)) {
    out.push({
      tone: 'bad',
      text: item.currentStage
        ? t('slot.dueAt', { serial, stage: item.currentStage.name })
        : t('slot.notFinished', { serial }),
    });
  }
  if (slot.side && item.positionLabel && item.positionLabel !== slot.side) {
    out.push({
      tone: 'bad',
      text: t(item.positionLabel === 'left' ? 'slot.sideLeft' : 'slot.sideRight', { serial }),
    });
  }
  return out;
}
