import type { Sequelize } from 'sequelize';
import { idParam } from '../../shared/schemas/common.js';
import { createPersonBody, listPeopleQuery, resetPasswordBody, updatePersonBody } from '../../shared/schemas/people.js';
import type { Api } from '../http/api.js';
import { createPerson, listPeople, resetPassword, updatePerson } from '../services/people.js';

export function peopleRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/people',
    access: 'people.manage',
    summary: 'List people, filtered by name or e-mail, role and whether active.',
    query: listPeopleQuery,
    handler: ({ query }) => listPeople(query),
  });
  api.define({
    method: 'post',
    path: '/people',
    access: 'people.manage',
    summary: 'Add a person with a role and a first password.',
    body: createPersonBody,
    status: 201,
    handler: ({ ctx, body }) => createPerson(sequelize, ctx, body),
  });
  api.define({
    method: 'patch',
    path: '/people/:id',
    access: 'people.manage',
    summary: 'Change a name or role, or deactivate (ends their sessions).',
    params: idParam,
    body: updatePersonBody,
    handler: ({ ctx, params, body }) => updatePerson(sequelize, ctx, params.id, body),
  });
  api.define({
    method: 'post',
    path: '/people/:id/password',
    access: 'people.manage',
    summary: 'Set a new password for someone (ends their sessions).',
    params: idParam,
    body: resetPasswordBody,
    handler: async ({ ctx, params, body }) => {
      await resetPassword(sequelize, ctx, params.id, body.password);
      return undefined;
    },
  });
}
