import { Op, type Transaction } from 'sequelize';
import type { Role } from '../../../shared/roles.js';
import { DISPOSITION_LABELS } from '../../../shared/schemas/ncr.js';
import { appLink } from '../../mail/links.js';
import { quoted, type Mail } from '../../mail/messages.js';
import { Nonconformance, User } from '../../models/index.js';

/** The mail an NCR's steps send, written in the same transaction as the step. */

const ncrLink = (number: string) => appLink(`/ncrs/${number}`);

async function recipients(roles: Role[], transaction: Transaction) {
  return User.findAll({
    where: { role: { [Op.in]: roles }, active: true },
    attributes: ['email', 'name'],
    transaction,
  });
}

export async function raisedMails(ncr: Nonconformance, serial: string, transaction: Transaction): Promise<Mail[]> {
  const roles: Role[] = ncr.severity === 'critical' ? ['quality', 'supervisor'] : ['quality'];
  const people = await recipients(roles, transaction);
  const text = [
    `${ncr.number} was raised on ${serial} (${ncr.severity}).`,
    '',
    'What was found:',
    quoted(ncr.description),
    '',
    ncr.itemId
      ? `The part is on hold until the NCR is decided. Open it: ${ncrLink(ncr.number)}`
      : `The lot cannot go into a unit until the NCR is decided. Open it: ${ncrLink(ncr.number)}`,
    '',
    '— Coretrail',
  ].join('\n');
  return people.map((p) => ({
    to: p.email,
    subject: `${ncr.severity === 'critical' ? 'Critical ' : ''}NCR ${ncr.number} raised on ${serial}`,
    text,
    reason: 'ncr.raised',
  }));
}

export async function decidedMail(
  t: Transaction,
  ncr: Nonconformance,
  serial: string,
  decider: string,
): Promise<Mail[]> {
  const raiser = await User.findByPk(ncr.raisedById, { attributes: ['email', 'name', 'active'], transaction: t });
  if (!raiser?.active) return [];
  return [
    {
      to: raiser.email,
      subject: `NCR ${ncr.number} on ${serial}: ${DISPOSITION_LABELS[ncr.disposition!]}`,
      text: [
        `${decider} decided ${ncr.number}, which you raised on ${serial}: ${DISPOSITION_LABELS[ncr.disposition!].toLowerCase()}.`,
        '',
        'Reason:',
        quoted(ncr.dispositionReason ?? ''),
        '',
        `Open it: ${ncrLink(ncr.number)}`,
        '',
        '— Coretrail',
      ].join('\n'),
      reason: 'ncr.decided',
    },
  ];
}

/** A critical use-as-is signed once: every other quality engineer is asked for the second signature. */
export async function countersignMails(
  t: Transaction,
  ncr: Nonconformance,
  serial: string,
  first: User,
): Promise<Mail[]> {
  const others = (await recipients(['quality'], t)).filter((u) => u.email !== first.email);
  return others.map((u) => ({
    to: u.email,
    subject: `Your signature is needed: use as is on critical NCR ${ncr.number} (${serial})`,
    text: [
      `${first.name} signed a use-as-is decision on ${ncr.number} (${serial}, critical). A critical use-as-is needs a second quality engineer before it takes effect.`,
      '',
      'Their reason:',
      quoted(ncr.dispositionReason ?? ''),
      '',
      `Read it and countersign, or void it: ${ncrLink(ncr.number)}`,
      '',
      '— Coretrail',
    ].join('\n'),
    reason: 'ncr.countersign_requested',
  }));
}
