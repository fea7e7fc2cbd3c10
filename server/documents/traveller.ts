import { localTime } from './content.js';
import { plantSettings } from '../services/plant.js';
import { findBySerial, presentItem } from '../services/items.js';
import { resultsOf } from '../services/results/index.js';
import { ACCENT, BAD, SOFT, newSheet, type PaperSize } from './pdf/kit.js';

// the words the screens use for an item's state (src/lib/item-status.ts)
const STATUS_LABELS: Record<string, string> = {
  received: 'Awaiting teardown',
  rejected: 'Rejected',
  torn_down: 'Torn down',
  in_process: 'On its route',
  in_stock: 'In stock',
  on_hold: 'On hold',
  finished: 'Finished',
  installed: 'Installed',
  released: 'Released',
  shipped: 'Shipped',
  scrapped: 'Scrapped',
};

const STATE_WORDS = { done: 'done', current: 'HERE NOW', todo: 'to do', skipped: 'skipped' } as const;

/**
 * A part's traveller: one page that goes with it along the line — its serial as a QR code and in
 * type large enough to read at arm's length, its family, and its route with where it stands at each
 * stage. A working paper, not a record: the results themselves are in Coretrail.
 */
export async function travellerPdf(serial: string, paper: PaperSize): Promise<{ pdf: Buffer; fileName: string }> {
  const item = await findBySerial(serial);
  const [card, plant, results] = await Promise.all([presentItem(item), plantSettings(), resultsOf(item.serial)]);
  const current = new Map(results.filter((r) => r.supersededBy === null).map((r) => [r.stage.code, r] as const));
  const now = new Date();
  const sheet = newSheet(paper, {
    title: `Traveller ${card.serial}`,
    author: plant.name,
    subject: `${card.kindLabel} ${card.serial}`,
    at: now,
  });
  const { doc, left, width } = sheet;
  const qr = 150;
  const top = doc.y;
  sheet.qr(card.serial, left + width - qr, top, qr);
  sheet.font('sans', 10, SOFT).text('Traveller', left, top, { width: width - qr - 16 });
  sheet.font('monoBold', 30).text(card.serial, left, doc.y + 2, { width: width - qr - 16 });
  sheet
    .font('sansBold', 14, ACCENT)
    .text(`${card.kindLabel}${card.positionLabel ? ` · ${card.positionLabel}` : ''}`, left, doc.y + 4, {
      width: width - qr - 16,
    });
  sheet.font('sans', 11).text(`${card.family.code} · ${card.family.name}`, left, doc.y + 2, { width: width - qr - 16 });
  const statusLabel = STATUS_LABELS[card.status] ?? card.status.replace(/_/g, ' ');
  sheet
    .font('sans', 10)
    .text(`Status: ${statusLabel}${card.currentStage ? ` · at ${card.currentStage.name}` : ''}`, left, doc.y + 2, {
      width: width - qr - 16,
    });
  if (card.harvestedFrom) sheet.font('sans', 9.5, SOFT).text(`From core ${card.harvestedFrom.serial}`, left, doc.y + 2);
  if (card.installedIn) sheet.font('sans', 9.5, SOFT).text(`Fitted in ${card.installedIn.serial}`, left, doc.y + 2);
  doc.y = Math.max(doc.y, top + qr) + 14;

  sheet.heading('Route');
  sheet.table(
    [
      { header: '#', width: 22, numeric: true },
      { header: 'Stage', width: width - 22 - 64 - 200 - 56 },
      { header: 'Status', width: 64 },
      { header: 'Last result', width: 200 },
      { header: 'Initials', width: 56 },
    ],
    card.route.map((s, i) => {
      const r = current.get(s.code);
      return {
        cells: [
          String(i + 1),
          `${s.name}${s.required ? '' : ' (optional)'}${s.hazard ? ' — caution' : ''}`,
          STATE_WORDS[s.state],
          r
            ? `${r.verdict === 'pass' ? 'pass' : 'FAIL'} · ${localTime(plant.timeZone, r.finishedAt)} · ${r.operator}`
            : '',
          '',
        ],
        bold: s.state === 'current' ? [1, 2] : [],
        color: r?.verdict === 'fail' ? [null, null, null, BAD, null] : [],
      };
    }),
    { size: 10 },
  );
  sheet.para(
    '“Caution” marks a stage with a hazard: follow the plant’s own procedure, local codes and licensed practice there. Results are recorded in Coretrail at each station; this sheet only travels with the part.',
    { size: 8, color: SOFT },
  );
  const pdf = await sheet.finish({
    left: `${plant.name} · Traveller`,
    right: card.serial,
    footer: `Printed ${localTime(plant.timeZone, now)} (${plant.timeZone}) · where it stood when printed`,
  });
  return { pdf, fileName: `traveller-${card.serial}-${paper === 'LETTER' ? 'letter' : 'a4'}.pdf` };
}
