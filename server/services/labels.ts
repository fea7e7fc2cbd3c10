import QRCode from 'qrcode';
import { Op, type Sequelize } from 'sequelize';
import { parseSerial } from '../../shared/domain/serial.js';
import { recordAudit, type Ctx } from '../audit.js';
import { invalid } from '../errors.js';
import { Item, LabelPrint } from '../models/index.js';

// QR error correction M (15 %) survives a scuffed tag; the quiet zone of 2 modules keeps it small
const QR_OPTIONS = { errorCorrectionLevel: 'M' as const, margin: 2 };

/** The QR that encodes a serial, as SVG (print) or PNG (download). It holds the serial and nothing else. */
export const labelSvg = (serial: string) => QRCode.toString(serial, { ...QR_OPTIONS, type: 'svg' });
export const labelPng = (serial: string) => QRCode.toBuffer(serial, { ...QR_OPTIONS, type: 'png', width: 480 });

/** Logs that labels were printed; a label printed before counts as a reprint. */
export async function recordLabelPrints(
  sequelize: Sequelize,
  ctx: Ctx,
  { serials, stock, reprintReason }: { serials: string[]; stock: string; reprintReason?: string },
) {
  const wanted = serials.map((s) => {
    const p = parseSerial(s);
    if (!p.ok) throw invalid(p.reason, { serials: `${s}: ${p.reason}` });
    return p.serial;
  });
  return sequelize.transaction(async (transaction) => {
    const items = await Item.findAll({ where: { serial: { [Op.in]: wanted } }, transaction });
    if (items.length !== new Set(wanted).size) {
      const known = new Set(items.map((i) => i.serial));
      throw invalid('Some serials are not on file.', { serials: wanted.filter((s) => !known.has(s)).join(', ') });
    }
    const printed = await LabelPrint.findAll({
      where: { itemId: { [Op.in]: items.map((i) => i.id) } },
      attributes: ['itemId'],
      transaction,
    });
    const before = new Set(printed.map((p) => p.itemId));
    // a second tag for a part is a question someone will ask later: the reason is kept with it
    const again = items.filter((i) => before.has(i.id)).map((i) => i.serial);
    if (again.length && !reprintReason) {
      throw invalid(`${again.join(', ')} ${again.length > 1 ? 'were' : 'was'} printed before: say why again.`, {
        reprintReason: 'Say why these labels are printed again.',
      });
    }
    const result = [];
    for (const item of items) {
      const reprint = before.has(item.id);
      await LabelPrint.create(
        { itemId: item.id, printedById: ctx.actor!.id, stock, reprint, reprintReason: reprint ? reprintReason : null },
        { transaction },
      );
      await recordAudit(ctx, transaction, {
        action: reprint ? 'label.reprinted' : 'label.printed',
        entity: 'item',
        entityId: item.serial,
        after: reprint ? { stock, reason: reprintReason } : { stock },
      });
      result.push({ serial: item.serial, reprint });
    }
    return { printed: result };
  });
}
