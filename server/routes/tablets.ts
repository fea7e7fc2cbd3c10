import type { Sequelize } from 'sequelize';
import { idParam } from '../../shared/schemas/common.js';
import { stationFormQuery } from '../../shared/schemas/results.js';
import { enrolTabletBody, setBadgeBody, setPinBody, tabletResultBody } from '../../shared/schemas/tablets.js';
import type { Config } from '../config.js';
import type { Api } from '../http/api.js';
import { TABLET_COOKIE, TABLET_DAYS, signTabletToken } from '../middleware/tablet.js';
import { stationForm } from '../services/results/index.js';
import {
  enrolTablet,
  listTablets,
  pinLimits,
  retireTablet,
  setBadge,
  setOwnPin,
  submitTabletResult,
  thisTablet,
} from '../services/tablets.js';
import { cookieOptions } from './auth.js';

export function tabletRoutes(api: Api, sequelize: Sequelize, config: Config) {
  const limits = pinLimits();
  api.define({
    method: 'get',
    path: '/tablets',
    access: 'stations.manage',
    summary: 'The shared station tablets enrolled, newest first, retired ones included.',
    handler: () => listTablets(),
  });
  api.define({
    method: 'post',
    path: '/tablets',
    access: 'stations.manage',
    summary:
      "Enrol this browser as a shared tablet for a station: it gets the tablet's own sign-in, which reads that station's forms and records nothing by itself.",
    body: enrolTabletBody,
    status: 201,
    handler: async ({ ctx, body, req, res }) => {
      const tablet = await enrolTablet(sequelize, ctx, body);
      res.cookie(TABLET_COOKIE, signTabletToken(config.JWT_SECRET, tablet.id), {
        ...cookieOptions(config, req),
        maxAge: TABLET_DAYS * 86_400_000,
      });
      return tablet;
    },
  });
  api.define({
    method: 'post',
    path: '/tablets/:id/retire',
    access: 'stations.manage',
    summary: 'Retire a tablet: its sign-in ends at once; its results keep naming it.',
    params: idParam,
    handler: ({ ctx, params }) => retireTablet(sequelize, ctx, params.id),
  });
  api.define({
    method: 'get',
    path: '/tablet',
    access: 'tablet',
    summary: 'This tablet: its label and the station it is enrolled to.',
    handler: ({ req }) => thisTablet(req.tablet!),
  });
  api.define({
    method: 'get',
    path: '/tablet/form',
    access: 'tablet',
    summary: "The tablet's station form for a scanned part (as GET /api/stations/:code/form).",
    query: stationFormQuery,
    handler: ({ req, query }) => stationForm(req.tablet!.station.code, query.serial),
  });
  api.define({
    method: 'post',
    path: '/tablet/results',
    access: 'tablet',
    summary:
      'Record a result on a shared tablet: the result body plus the badge and PIN of the person who took it (wrong PINs limited per badge and per tablet).',
    body: tabletResultBody,
    handler: async ({ req, body, res }) => {
      const out = await submitTabletResult(sequelize, limits, req.tablet!, req.id ?? null, body);
      if (out.replay) res.setHeader('Idempotent-Replayed', 'true');
      res.status(out.status).json(out.body);
      return undefined;
    },
  });
  api.define({
    method: 'put',
    path: '/people/:id/badge',
    access: 'people.manage',
    summary: "Set or clear a person's badge (what a shared tablet scans to identify them).",
    params: idParam,
    body: setBadgeBody,
    handler: async ({ ctx, params, body }) => {
      await setBadge(sequelize, ctx, params.id, body.badge);
      return undefined;
    },
  });
  api.define({
    method: 'put',
    path: '/auth/pin',
    access: 'results.record',
    summary: 'Set your own PIN for shared tablets (4 to 8 digits), with your password typed again.',
    body: setPinBody,
    limit: 'password-change',
    handler: async ({ ctx, body }) => {
      await setOwnPin(sequelize, ctx, body.pin, body.password);
      return undefined;
    },
  });
}
