import type { PartKind } from './reference.js';

/** Replies of /api/items: what a scanned serial resolves to. Built by server/services/items.ts. */
export type RouteStep = {
  code: string;
  name: string;
  position: number;
  required: boolean;
  hazard: string | null;
  /** `skipped`: a stage the item will never reach, e.g. teardown of a core rejected at intake. */
  state: 'done' | 'current' | 'todo' | 'skipped';
};

export type ItemPart = {
  serial: string;
  kind: PartKind;
  kindLabel: string;
  status: string;
  positionLabel: string | null;
};

export type ItemJson = {
  serial: string;
  kind: PartKind;
  kindLabel: string;
  family: { id: number; code: string; name: string; layout: 'inline' | 'v'; headsPerEngine: number };
  status: string;
  positionLabel: string | null;
  currentStage: { code: string; name: string; hazard: string | null } | null;
  route: RouteStep[];
  harvestedFrom: { serial: string; kind: PartKind } | null;
  /** The long block a part is installed in. */
  installedIn: { serial: string } | null;
  /** A core's harvested parts, or a long block's installed ones. */
  parts: ItemPart[];
  /** For a core: what intake found missing or damaged (no customer or credit details). */
  intakeCondition: { complete: boolean; missing: string[]; damage: string[] } | null;
  createdAt: string;
};
