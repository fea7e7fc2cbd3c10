import type { PartKind } from '../../../shared/schemas/reference';

/*
 * The replies of /api/items and /api/cores, as the server's presenters build them
 * (server/services/items.ts presentItem, intake.ts coreDetail). They are written out here because
 * src may not import server code; they belong in shared/ once the server exports them from there.
 */

export type RouteStep = {
  code: string;
  name: string;
  position: number;
  required: boolean;
  hazard: string | null;
  state: 'done' | 'current' | 'todo';
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
  parts: ItemPart[];
  createdAt: string;
};
