import type { Sequelize } from 'sequelize';
import { idParam } from '../../shared/schemas/common.js';
import { serialParam } from '../../shared/schemas/intake.js';
import {
  correctResultBody,
  reentryBody,
  stationFormQuery,
  stationParam,
  submitResultBody,
} from '../../shared/schemas/results.js';
import type { Api } from '../http/api.js';
import { allowReentry, resultsOf, stationForm, stationQueues, submitResult } from '../services/results/index.js';

export function stationRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/stations/:code/form',
    access: 'station.form',
    summary:
      "What a station records for a scanned part: whether it is due here, the stage's characteristics with the rules in force, gauges.",
    params: stationParam,
    query: stationFormQuery,
    handler: ({ params, query }) => stationForm(params.code, query.serial),
  });
  api.define({
    method: 'get',
    path: '/station-queues',
    access: 'station.form',
    summary: 'Each station in service with the parts waiting at its stage now, in route order (the station chooser).',
    handler: () => stationQueues(sequelize),
  });
  api.define({
    method: 'post',
    path: '/results',
    access: 'results.record',
    summary:
      'Record a station result. Judged against the rules in force; a failure raises an NCR and holds the part. Idempotent by key.',
    body: submitResultBody,
    handler: async ({ ctx, body, res }) => {
      const out = await submitResult(sequelize, ctx, body);
      if (out.replay) res.setHeader('Idempotent-Replayed', 'true');
      res.status(out.status).json(out.body);
      return undefined;
    },
  });
  api.define({
    method: 'post',
    path: '/results/:id/correction',
    access: 'results.correct',
    summary: 'Correct a result: a new result with a reason supersedes it; both stay in the history.',
    params: idParam,
    body: correctResultBody,
    handler: async ({ ctx, params, body, res }) => {
      const out = await submitResult(sequelize, ctx, body, {
        path: `/api/results/${params.id}/correction`,
        correction: { resultId: params.id, reason: body.reason },
      });
      if (out.replay) res.setHeader('Idempotent-Replayed', 'true');
      res.status(out.status).json(out.body);
      return undefined;
    },
  });
  api.define({
    method: 'get',
    path: '/items/:serial/results',
    access: 'items.read',
    summary: "An item's station results, newest first, with readings, verdicts and the rule versions used.",
    params: serialParam,
    handler: ({ params }) => resultsOf(params.serial),
  });
  api.define({
    method: 'post',
    path: '/items/:serial/reentry',
    access: 'stage.reentry',
    summary: 'Allow a part back through a stage it has passed, with a reason; the next result there carries it.',
    params: serialParam,
    body: reentryBody,
    handler: ({ ctx, params, body }) => allowReentry(sequelize, ctx, params.serial, body),
  });
}
