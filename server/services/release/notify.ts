import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { appLink } from '../../mail/links.js';
import { enqueueMail } from '../../mail/messages.js';
import { Item, User } from '../../models/index.js';
import { releaseCheck } from './check.js';

/**
 * After an NCR closes or is voided: when the part sits in a finished unit that now passes the
 * gate, tell shipping it can go. Runs in the NCR step's transaction.
 */
export async function notifyIfReleasable(sequelize: Sequelize, itemId: number, transaction: Transaction) {
  const item = await Item.findByPk(itemId, { transaction });
  if (!item) return;
  let unit: Item | null = item.kind === 'long_block' ? item : null;
  if (!unit) {
    const [row] = await sequelize.query<{ parent_item_id: number }>(
      `SELECT parent_item_id FROM item_links WHERE child_item_id = :id AND link_type = 'installed_in' AND removed_at IS NULL`,
      { type: QueryTypes.SELECT, replacements: { id: itemId }, transaction },
    );
    unit = row ? await Item.findByPk(row.parent_item_id, { transaction }) : null;
  }
  if (!unit || unit.status !== 'finished') return;
  const check = await releaseCheck(sequelize, unit, transaction);
  if (!check.releasable) return;
  const shipping = await User.findAll({
    where: { role: 'shipping', active: true },
    attributes: ['email'],
    transaction,
  });
  await enqueueMail(
    transaction,
    shipping.map((u) => ({
      to: u.email,
      subject: `${unit.serial} can ship: nothing holds it any more`,
      text: [
        `The hold on ${unit.serial} has been cleared and it passes every check of the release gate.`,
        '',
        `Release it: ${appLink(`/release?serial=${unit.serial}`)}`,
        '',
        '— Coretrail',
      ].join('\n'),
      reason: 'unit.releasable',
    })),
  );
}
