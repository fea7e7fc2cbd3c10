import type { Sequelize } from 'sequelize';
import { confirmSecondFactorBody, liftLockoutBody, removeSecondFactorBody } from '../../shared/schemas/auth.js';
import { idParam } from '../../shared/schemas/common.js';
import type { Config } from '../config.js';
import type { Api } from '../http/api.js';
import { liftLockout, listLockouts } from '../services/lockouts.js';
import {
  confirmEnrolment,
  removeOwnSecondFactor,
  resetSecondFactor,
  secondFactorStatus,
  startEnrolment,
} from '../services/second-factor.js';
import { endOtherSessions, ownSessions } from '../services/sessions.js';

/** Your own sessions and second factor; an admin's view of lock-outs and of others' second factors. */
export function accountRoutes(api: Api, sequelize: Sequelize, config: Config) {
  const idle = { idleMin: config.IDLE_TIMEOUT_MIN, shiftHours: config.SHIFT_HOURS };

  api.define({
    method: 'get',
    path: '/auth/sessions',
    access: 'signed-in',
    summary: 'Your own sessions still in force, newest use first; the one you are using is marked.',
    handler: ({ user }) => ownSessions(user!.id, user!.sessionId, idle),
  });
  api.define({
    method: 'post',
    path: '/auth/sessions/end-others',
    access: 'signed-in',
    summary: 'Sign out everywhere else: every other session of yours ends; this one stays.',
    handler: ({ user, ctx }) => endOtherSessions(sequelize, ctx, user!.id, user!.sessionId),
  });

  api.define({
    method: 'get',
    path: '/auth/second-factor',
    access: 'signed-in',
    enrolment: true,
    summary: 'Whether you have a second factor, whether your role must, and how many recovery codes are left.',
    handler: ({ user }) => secondFactorStatus(user!.id),
  });
  api.define({
    method: 'post',
    path: '/auth/second-factor/start',
    access: 'signed-in',
    enrolment: true,
    summary: 'Start enrolling an authenticator app: a new secret, its otpauth:// address and QR code (SVG).',
    handler: ({ user, ctx }) => startEnrolment(sequelize, ctx, user!.id, config.JWT_SECRET),
  });
  api.define({
    method: 'post',
    path: '/auth/second-factor/confirm',
    access: 'signed-in',
    enrolment: true,
    summary: 'Confirm enrolment with the code the app shows; replies with ten recovery codes, shown once.',
    body: confirmSecondFactorBody,
    handler: ({ user, ctx, body }) =>
      confirmEnrolment(sequelize, ctx, user!.id, user!.sessionId, body.code, config.JWT_SECRET),
  });
  api.define({
    method: 'post',
    path: '/auth/second-factor/remove',
    access: 'signed-in',
    limit: 'password-change',
    summary: 'Turn your second factor off, with your password (not for administrators, who must keep one).',
    body: removeSecondFactorBody,
    handler: async ({ user, ctx, body }) => {
      await removeOwnSecondFactor(sequelize, ctx, user!.id, body.password);
      return undefined;
    },
  });

  api.define({
    method: 'post',
    path: '/people/:id/second-factor/reset',
    access: 'people.manage',
    summary: "Clear someone's second factor (a lost phone); their sessions end and they enrol again.",
    params: idParam,
    handler: async ({ ctx, params }) => {
      await resetSecondFactor(sequelize, ctx, params.id);
      return undefined;
    },
  });
  api.define({
    method: 'get',
    path: '/lockouts',
    access: 'people.manage',
    summary: 'Sign-in and password lock-outs in force in this API process: accounts and addresses.',
    handler: () => listLockouts(api.limits),
  });
  api.define({
    method: 'post',
    path: '/lockouts/lift',
    access: 'people.manage',
    summary: 'Lift the lock-out of an account (by e-mail) or of an address; audited.',
    body: liftLockoutBody,
    handler: async ({ ctx, body }) => {
      await liftLockout(sequelize, ctx, api.limits, body);
      return undefined;
    },
  });
}
