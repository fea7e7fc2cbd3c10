import type { Sequelize } from 'sequelize';
import {
  addSourceBody,
  caListQuery,
  caParam,
  closeCaBody,
  containmentLinkBody,
  evidenceBody,
  openCaBody,
  taskBody,
  taskDoneBody,
  taskListQuery,
  taskParam,
  teamBody,
  updateCaBody,
  verifyBody,
} from '../../shared/schemas/corrective-action.js';
import type { Api } from '../http/api.js';
import { addTask, closeCa, completeTask, listTasks, verifyCa } from '../services/corrective-action/actions.js';
import { caDetail, listCas } from '../services/corrective-action/detail.js';
import {
  addSource,
  attachEvidence,
  linkContainment,
  openCa,
  peopleOptions,
  setTeam,
  updateCa,
} from '../services/corrective-action/records.js';

export function correctiveActionRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/corrective-actions',
    access: 'corrective-actions.read',
    summary: 'Corrective actions, newest first, with their actions done and overdue; filter open or closed.',
    query: caListQuery,
    handler: ({ query }) => listCas(sequelize, query),
  });
  api.define({
    method: 'get',
    path: '/corrective-actions/actions',
    access: 'corrective-actions.read',
    summary: 'Actions across open corrective actions, by due date: the caller’s own or everyone’s, overdue or not.',
    query: taskListQuery,
    handler: ({ ctx, query }) => listTasks(sequelize, ctx, query),
  });
  api.define({
    method: 'get',
    path: '/corrective-actions/people',
    access: 'corrective-actions.manage',
    summary: 'Everyone active, by name: who can sit on a team or own an action.',
    handler: () => peopleOptions(),
  });
  api.define({
    method: 'post',
    path: '/corrective-actions',
    access: 'corrective-actions.manage',
    summary: 'Open a corrective action from one or many NCRs and claims, with its title, problem and team.',
    body: openCaBody,
    status: 201,
    handler: ({ ctx, body }) => openCa(sequelize, ctx, body),
  });
  api.define({
    method: 'get',
    path: '/corrective-actions/:number',
    access: 'corrective-actions.read',
    summary:
      'One corrective action: sources, team, problem, containment and its links, root cause and evidence, actions, verification, signatures, what blocks closure.',
    params: caParam,
    handler: ({ params }) => caDetail(sequelize, params.number),
  });
  api.define({
    method: 'patch',
    path: '/corrective-actions/:number',
    access: 'corrective-actions.manage',
    summary: 'Write the title, problem statement, containment, root cause, or the day effectiveness is checked.',
    params: caParam,
    body: updateCaBody,
    handler: ({ ctx, params, body }) => updateCa(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/corrective-actions/:number/sources',
    access: 'corrective-actions.manage',
    summary: 'Add another NCR or claim the corrective action answers.',
    params: caParam,
    body: addSourceBody,
    status: 201,
    handler: ({ ctx, params, body }) => addSource(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'put',
    path: '/corrective-actions/:number/team',
    access: 'corrective-actions.manage',
    summary: 'Set the team (someone who leaves keeps their ended row).',
    params: caParam,
    body: teamBody,
    handler: ({ ctx, params, body }) => setTeam(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/corrective-actions/:number/containment',
    access: 'corrective-actions.manage',
    summary: 'Link a hold (the NCR holding a part or lot) or a field action as containment.',
    params: caParam,
    body: containmentLinkBody,
    status: 201,
    handler: ({ ctx, params, body }) => linkContainment(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/corrective-actions/:number/evidence',
    access: 'corrective-actions.manage',
    summary: 'Attach uploaded photos or PDFs as evidence of the root cause.',
    params: caParam,
    body: evidenceBody,
    status: 201,
    handler: ({ ctx, params, body }) => attachEvidence(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/corrective-actions/:number/actions',
    access: 'corrective-actions.manage',
    summary: 'Add a corrective or preventive action with its owner and due date; the owner is mailed.',
    params: caParam,
    body: taskBody,
    status: 201,
    handler: ({ ctx, params, body }) => addTask(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/corrective-actions/:number/actions/:id/done',
    access: 'corrective-actions.read',
    summary: 'Mark an action done with what was done: its owner, or a quality engineer.',
    params: taskParam,
    body: taskDoneBody,
    handler: ({ ctx, params, body }) => completeTask(sequelize, ctx, params.number, params.id, body),
  });
  api.define({
    method: 'post',
    path: '/corrective-actions/:number/verify',
    access: 'corrective-actions.manage',
    summary: 'Record whether the actions proved effective, once all are done and the day for the check has come.',
    params: caParam,
    body: verifyBody,
    handler: ({ ctx, params, body }) => verifyCa(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/corrective-actions/:number/close',
    access: 'corrective-actions.manage',
    summary: 'Close with quality’s signature, once nothing blocks it (409 not_closable lists what does).',
    params: caParam,
    body: closeCaBody,
    handler: ({ ctx, params, body }) => closeCa(sequelize, ctx, params.number, body),
  });
}
