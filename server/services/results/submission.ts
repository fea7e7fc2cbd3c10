import type { Sequelize, Transaction } from 'sequelize';
import type { SubmitResultBody } from '../../../shared/schemas/results.js';
import type { Ctx } from '../../audit.js';
import type { Gauge, Item, Stage, StageReentry, StageResult } from '../../models/index.js';
import type { Reference } from '../reference-cache.js';
import type { FormChar, Route, stationByCode } from './common.js';

/** A correction of the current result at a stage, with its reason. */
export type Correction = { resultId: number; reason: string };

/** Everything the steps of recording one result share, once the part is locked and its place checked. */
export type Submission = {
  sequelize: Sequelize;
  ctx: Ctx;
  transaction: Transaction;
  body: SubmitResultBody;
  ref: Reference;
  station: ReturnType<typeof stationByCode>['station'];
  stage: Stage;
  item: Item;
  route: Route | null;
  reentry: StageReentry | null;
  correction: Correction | null;
  /** The shared station tablet the person identified on (badge and PIN), kept with the result. */
  tablet: { id: number; label: string } | null;
  /** The result this one corrects, for a correction. */
  supersedes: StageResult | null;
  now: Date;
  takenAt: Date;
  chars: FormChar[];
};

/** The result's gauge, and the gauge of each measured characteristic taken with another one. */
export type ChosenGauges = { gauge: Gauge | null; gaugeOf: Map<string, Gauge> };

/** Whether the result uses a supervisor's re-entry (a correction never does). */
export const usesReentry = (s: Submission) => !!s.reentry && s.reentry.stageId === s.stage.id && !s.supersedes;
