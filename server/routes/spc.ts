import type { Sequelize } from 'sequelize';
import { idParam } from '../../shared/schemas/common.js';
import {
  freezeLimitsBody,
  holdSignalBody,
  limitsListQuery,
  rehearseBody,
  signalsQuery,
  spcCapabilityQuery,
  spcChartQuery,
} from '../../shared/schemas/spc.js';
import type { Api } from '../http/api.js';
import { spcCapability } from '../services/spc/capability.js';
import { spcChart } from '../services/spc/charts.js';
import { freezeLimits, limitsHistory } from '../services/spc/limits.js';
import { listRehearsals, rehearseDraft } from '../services/spc/rehearsal.js';
import { holdSignalPart } from '../services/spc/signal-hold.js';
import { listSignals } from '../services/spc/signal-list.js';

export function spcRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/spc/chart',
    access: 'spc.read',
    summary:
      'A control chart of a characteristic over a period, with run-rule signals, capability, histogram and normality check.',
    query: spcChartQuery,
    handler: ({ query }) => spcChart(sequelize, query),
  });
  api.define({
    method: 'get',
    path: '/spc/capability',
    access: 'spc.read',
    summary: 'Cp, Cpk with its interval, Pp and Ppk over a period: all results, then each station × gauge.',
    query: spcCapabilityQuery,
    handler: ({ query }) => spcCapability(sequelize, query),
  });
  api.define({
    method: 'get',
    path: '/spc/limits',
    access: 'spc.read',
    summary: 'Control limits frozen for a family × characteristic, newest first, with who froze them, when and why.',
    query: limitsListQuery,
    handler: ({ query }) => limitsHistory(sequelize, query),
  });
  api.define({
    method: 'post',
    path: '/spc/limits',
    access: 'spc.freeze',
    summary:
      'Freeze control limits computed from a baseline period; they supersede the ones in force for the same scope.',
    body: freezeLimitsBody,
    status: 201,
    handler: ({ ctx, body }) => freezeLimits(sequelize, ctx, body),
  });
  api.define({
    method: 'get',
    path: '/spc/signals',
    access: 'spc.read',
    summary: 'Run-rule signals station results raised against frozen limits, newest first, with any hold.',
    query: signalsQuery,
    handler: ({ query }) => listSignals(sequelize, query),
  });
  api.define({
    method: 'post',
    path: '/spc/signals/:id/hold',
    access: 'spc.hold',
    summary: "Put a signal's part on hold: an NCR is raised, as for a concern.",
    params: idParam,
    body: holdSignalBody,
    handler: ({ ctx, params, body }) => holdSignalPart(sequelize, ctx, params.id, body.reason),
  });
  api.define({
    method: 'post',
    path: '/spec/rules/:id/rehearsals',
    access: 'spec.edit',
    summary:
      'Rehearse a draft over stored readings: parts that would flip, Cpk before and after, shipped units affected.',
    params: idParam,
    body: rehearseBody,
    status: 201,
    handler: ({ ctx, params, body }) => rehearseDraft(sequelize, ctx, params.id, body),
  });
  api.define({
    method: 'get',
    path: '/spec/rules/:id/rehearsals',
    access: 'spec.read',
    summary: "A rule's rehearsals, newest first; the one kept with its approval is marked.",
    params: idParam,
    handler: ({ params }) => listRehearsals(params.id),
  });
}
