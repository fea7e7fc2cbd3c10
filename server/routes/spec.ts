import type { Sequelize } from 'sequelize';
import { idParam } from '../../shared/schemas/common.js';
import {
  approveRuleBody,
  createDraftBody,
  ruleHistoryQuery,
  specBookQuery,
  updateDraftBody,
} from '../../shared/schemas/spec.js';
import type { Api } from '../http/api.js';
import { approveRule, createDraft, discardDraft, ruleHistory, specBook, updateDraft } from '../services/spec/index.js';

export function specRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/spec/book',
    access: 'spec.read',
    summary:
      "A family's spec book: each stage's characteristics with the rule in force, any scheduled version and draft.",
    query: specBookQuery,
    handler: ({ query }) => specBook(query.family),
  });
  api.define({
    method: 'get',
    path: '/spec/history',
    access: 'spec.read',
    summary: 'Every version of one rule (family × characteristic), newest first, with signatures.',
    query: ruleHistoryQuery,
    handler: ({ query }) => ruleHistory(query.family, query.characteristicId),
  });
  api.define({
    method: 'post',
    path: '/spec/rules',
    access: 'spec.edit',
    summary: 'Start the next version of a rule as a draft (one draft at a time per family × characteristic).',
    body: createDraftBody,
    status: 201,
    handler: ({ ctx, body }) => createDraft(sequelize, ctx, body.family, body.characteristicId, body.limits),
  });
  api.define({
    method: 'patch',
    path: '/spec/rules/:id',
    access: 'spec.edit',
    summary: "Edit a draft's limits. An approved version is never edited (409).",
    params: idParam,
    body: updateDraftBody,
    handler: ({ ctx, params, body }) => updateDraft(sequelize, ctx, params.id, body.limits),
  });
  api.define({
    method: 'post',
    path: '/spec/rules/:id/discard',
    access: 'spec.edit',
    summary: 'Discard a draft; it stays on record as discarded.',
    params: idParam,
    handler: ({ ctx, params }) => discardDraft(sequelize, ctx, params.id),
  });
  api.define({
    method: 'post',
    path: '/spec/rules/:id/approve',
    access: 'spec.approve',
    limit: 'signature',
    summary: "Approve a draft with the approver's signature (password re-entered); it supersedes the version in force.",
    params: idParam,
    body: approveRuleBody,
    handler: ({ ctx, params, body }) => approveRule(sequelize, ctx, params.id, body),
  });
}
