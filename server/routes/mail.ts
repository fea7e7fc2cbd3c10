import { z } from 'zod';
import { idText } from '../../shared/schemas/common.js';
import { outboxQuery } from '../../shared/schemas/mail.js';
import type { Config } from '../config.js';
import { notFound } from '../errors.js';
import type { Api } from '../http/api.js';
import { readMailSink } from '../mail/sink.js';
import { MailOutbox } from '../models/index.js';

export function mailRoutes(api: Api, config: Config) {
  api.define({
    method: 'get',
    path: '/mail/outbox',
    access: 'mail.read',
    summary: 'The outbox: every message Coretrail has queued, with its delivery state and attempts.',
    query: outboxQuery,
    handler: async ({ query }) => {
      const { rows, count } = await MailOutbox.findAndCountAll({
        where: query.status ? { status: query.status } : {},
        order: [['id', 'DESC']],
        limit: query.pageSize,
        offset: (query.page - 1) * query.pageSize,
      });
      return {
        rows: rows.map((m) => ({
          id: Number(m.id),
          to: m.toAddress,
          subject: m.subject,
          reason: m.reason,
          status: m.status,
          attempts: m.attempts,
          lastError: m.lastError,
          createdAt: m.createdAt.toISOString(),
          sentAt: m.sentAt?.toISOString() ?? null,
        })),
        total: count,
        page: query.page,
        pageSize: query.pageSize,
      };
    },
  });
  api.define({
    method: 'get',
    path: '/mail/outbox/:id',
    access: 'mail.read',
    summary: 'One queued message as it was (or will be) sent: recipient, subject, body, Message-ID, delivery state.',
    params: z.strictObject({ id: idText() }),
    handler: async ({ params }) => {
      const m = await MailOutbox.findByPk(params.id);
      if (!m) throw notFound('That message');
      return {
        id: Number(m.id),
        to: m.toAddress,
        subject: m.subject,
        text: m.bodyText,
        messageId: m.messageId,
        reason: m.reason,
        status: m.status,
        attempts: m.attempts,
        lastError: m.lastError,
        createdAt: m.createdAt.toISOString(),
        sentAt: m.sentAt?.toISOString() ?? null,
      };
    },
  });
  api.define({
    method: 'get',
    path: '/mail/sink',
    access: 'mail.read',
    summary: 'What the local loopback mail sink has received, newest first (development and demo only).',
    handler: async () => readMailSink(config.MAIL_SINK_DIR),
  });
}
