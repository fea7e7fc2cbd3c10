import PDFDocument from 'pdfkit';
import type { Sequelize } from 'sequelize';
import { csvDocument } from '../../../shared/csv.js';
import { WHERE_NOW_LABELS, type BlastQuery } from '../../../shared/schemas/gauges.js';
import { blastRadius, blastReadings } from './radius.js';
import { scopeOf } from './scope.js';

/** The blast radius as files: every reading as CSV (one row each, with where its part is now), a summary as PDF. */

export async function blastCsv(sequelize: Sequelize, q: BlastQuery): Promise<string> {
  const summary = await blastRadius(sequelize, q, 0, null);
  const where = new Map(summary.parts.map((p) => [p.serial, p]));
  const readings = await blastReadings(sequelize, await scopeOf(q), null);
  const header = [
    'serial',
    'stage',
    'characteristic',
    'position',
    'value',
    'unit',
    'verdict',
    'lower',
    'upper',
    'verdict_could_change',
    'taken_at',
    'operator',
    'gauge',
    'unit_serial',
    'where_now',
    'customer',
    'ship_date',
    'order',
  ];
  const rows = readings.map((r) => {
    const p = where.get(r.serial);
    return [
      r.serial,
      r.stage,
      r.characteristic,
      r.position,
      r.value,
      r.unit,
      r.verdict,
      r.lower,
      r.upper,
      r.couldChange ? 'yes' : 'no',
      r.takenAt,
      r.operator,
      r.gauge,
      p?.unit,
      p ? WHERE_NOW_LABELS[p.where] : '',
      p?.customer,
      p?.shipDate,
      p?.order,
    ];
  });
  // a lot touches units, not readings: one row per unit
  const lotRows =
    summary.trigger.kind === 'lot'
      ? summary.parts.map((p) => [
          p.serial,
          '',
          '',
          '',
          '',
          '',
          '',
          '',
          '',
          '',
          '',
          '',
          '',
          p.unit,
          WHERE_NOW_LABELS[p.where],
          p.customer,
          p.shipDate,
          p.order,
        ])
      : [];
  return csvDocument(header, [...rows, ...lotRows]);
}

const winAnsi = (text: string) => text.replace(/≥/g, '>=').replace(/≤/g, '<=').replace(/−/g, '-').replace(/[–—]/g, '-');

export async function blastPdf(sequelize: Sequelize, q: BlastQuery): Promise<Buffer> {
  const b = await blastRadius(sequelize, q, 40, null);
  const doc = new PDFDocument({ size: 'A4', margin: 48, info: { Title: 'Blast radius', Author: 'Coretrail' } });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) => doc.on('end', () => resolve(Buffer.concat(chunks))));
  const line = (t: string, font = 'Helvetica', size = 9) => doc.font(font).fontSize(size).text(winAnsi(t));
  line('Blast radius', 'Helvetica-Bold', 16);
  line(b.trigger.label, 'Helvetica', 11);
  line(`Printed ${new Date().toISOString()}`);
  doc.moveDown();
  const t = b.totals;
  line(
    `${t.readings} readings, ${t.couldChange} of which could change verdict; ${t.parts} parts; ${t.units} units; ` +
      `${t.inPlant} in the plant, ${t.onHold} on hold, ${t.shipped} shipped to ${t.customers} customer(s).`,
  );
  if (b.guardBand) line(`Guard band: the as-found error, ${b.guardBand.error} ${b.guardBand.unit ?? ''}.`);
  doc.moveDown();
  line('Parts', 'Helvetica-Bold', 11);
  for (const p of b.parts) {
    line(
      `${p.serial}  ${p.kind}  ${p.readings} readings (${p.couldChange} doubtful)  unit ${p.unit ?? '-'}  ${WHERE_NOW_LABELS[p.where]}` +
        (p.customer ? `  to ${p.customer} on ${p.shipDate} (order ${p.order})` : ''),
      'Courier',
      8,
    );
  }
  doc.moveDown();
  line('Customers with shipped units', 'Helvetica-Bold', 11);
  for (const c of b.customers) line(`${c.name}: ${c.units.map((u) => `${u.serial} (${u.shipDate})`).join(', ')}`);
  if (!b.customers.length) line('None.');
  doc.moveDown();
  line('First readings, most doubtful first (all of them are in the CSV)', 'Helvetica-Bold', 11);
  for (const r of b.readings) {
    line(
      `${r.serial}  ${r.characteristic} ${r.position}  ${r.value ?? '-'} ${r.unit ?? ''}  ${r.verdict}${r.couldChange ? '  COULD CHANGE' : ''}  ${r.takenAt.slice(0, 16)}`,
      'Courier',
      8,
    );
  }
  doc.end();
  return done;
}
