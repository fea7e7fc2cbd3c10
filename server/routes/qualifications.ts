import type { Sequelize } from 'sequelize';
import { idParam } from '../../shared/schemas/common.js';
import {
  expiringQuery,
  signQualificationBody,
  withdrawQualificationBody,
} from '../../shared/schemas/qualifications.js';
import type { Api } from '../http/api.js';
import {
  expiringQualifications,
  qualificationMatrix,
  signQualification,
  withdrawQualification,
} from '../services/qualifications.js';

export function qualificationRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/qualifications',
    access: 'qualifications.read',
    summary: 'Who may record which stage: the people who record results × the stages, each with the sign-off in force.',
    handler: () => qualificationMatrix(sequelize),
  });
  api.define({
    method: 'get',
    path: '/qualifications/expiring',
    access: 'qualifications.read',
    summary: 'Qualifications in force that expire within the next days, or expired within as many days, soonest first.',
    query: expiringQuery,
    handler: ({ query }) => expiringQualifications(sequelize, query.days),
  });
  api.define({
    method: 'post',
    path: '/qualifications',
    access: 'qualifications.manage',
    summary: 'Sign a person off to record a stage from a training day to an expiry day (password as signature).',
    body: signQualificationBody,
    limit: 'signature',
    status: 201,
    handler: ({ ctx, body }) => signQualification(sequelize, ctx, body),
  });
  api.define({
    method: 'post',
    path: '/qualifications/:id/withdraw',
    access: 'qualifications.manage',
    summary: 'Withdraw a qualification before its expiry, with a reason (password as signature).',
    params: idParam,
    body: withdrawQualificationBody,
    limit: 'signature',
    handler: ({ ctx, params, body }) => withdrawQualification(sequelize, ctx, params.id, body),
  });
}
