import { z } from 'zod';
import type { AttachmentJson } from './attachments.js';
import { id, idText, paging, text } from './common.js';
import { isoDate, signaturePassword } from './warranty.js';

/**
 * Corrective actions: one problem record for one or many NCRs and claims, in the plant's own
 * words — team, problem, containment, root cause with evidence, corrective and preventive actions
 * with owners and due dates, verification of effectiveness after a set time, closure signed by
 * quality (ISO 9001:2015 10.2; IATF 16949 10.2.3–10.2.6).
 */

export const CA_STATES = ['open', 'closed'] as const;
export type CaState = (typeof CA_STATES)[number];
export const TASK_KINDS = ['corrective', 'preventive'] as const;
export type TaskKind = (typeof TASK_KINDS)[number];
export const TASK_KIND_LABELS: Record<TaskKind, string> = {
  corrective: 'Corrective (removes the cause)',
  preventive: 'Preventive (stops it elsewhere)',
};

const said = (min: number, what: string, max = 4000) =>
  text(`Say ${what}.`)
    .trim()
    .min(min, `Say ${what}, in at least ${min} characters.`)
    .max(max, `At most ${max} characters.`);
const words = (max: number) => text().trim().max(max, `At most ${max} characters.`);
const ncrNumber = text()
  .trim()
  .toUpperCase()
  .regex(/^NC-\d{4}-\d{5,}$/, 'An NCR number looks like NC-2026-00007.');
const claimNumber = text()
  .trim()
  .toUpperCase()
  .regex(/^WC-\d{4}-\d{5,}$/, 'A claim number looks like WC-2026-00007.');
const faNumber = text()
  .trim()
  .toUpperCase()
  .regex(/^FA-\d{4}-\d{5,}$/, 'A field action number looks like FA-2026-00007.');
const member = z.strictObject({ userId: id(), role: words(80).default('') });

export const CA_NUMBER = /^CA-\d{4}-\d{5,}$/;
export const caParam = z.strictObject({
  number: text().trim().toUpperCase().regex(CA_NUMBER, 'A corrective action number looks like CA-2026-00007.'),
});
export const taskParam = caParam.extend({ id: idText() });

export const openCaBody = z
  .strictObject({
    title: said(5, 'what the problem is, in a line', 160),
    problem: words(4000).default(''),
    ncrs: z.array(ncrNumber).max(50, 'At most 50 NCRs.').default([]),
    claims: z.array(claimNumber).max(50, 'At most 50 claims.').default([]),
    team: z.array(member).max(20, 'At most 20 people.').default([]),
  })
  .refine((b) => b.ncrs.length + b.claims.length > 0, {
    message: 'Open it from at least one NCR or claim.',
    path: ['ncrs'],
  });
export type OpenCaBody = z.input<typeof openCaBody>;

export const updateCaBody = z
  .strictObject({
    title: said(5, 'what the problem is, in a line', 160).optional(),
    problem: words(4000).optional(),
    containment: words(4000).optional(),
    rootCause: words(4000).optional(),
    verificationDueOn: isoDate.nullable().optional(),
  })
  .refine((b) => Object.keys(b).length > 0, { message: 'Change something.' });
export type UpdateCaBody = z.input<typeof updateCaBody>;

export const addSourceBody = z
  .strictObject({ ncr: ncrNumber.optional(), claim: claimNumber.optional() })
  .refine((b) => !b.ncr !== !b.claim, { message: 'Add one NCR or one claim.', path: ['ncr'] });
export type AddSourceBody = z.input<typeof addSourceBody>;
export const teamBody = z.strictObject({ members: z.array(member).max(20, 'At most 20 people.') });
export type TeamBody = z.input<typeof teamBody>;
export const containmentLinkBody = z
  .strictObject({ ncr: ncrNumber.optional(), fieldAction: faNumber.optional(), note: words(500).default('') })
  .refine((b) => !b.ncr !== !b.fieldAction, { message: 'Link one hold (its NCR) or one field action.', path: ['ncr'] });
export type ContainmentLinkBody = z.input<typeof containmentLinkBody>;
export const evidenceBody = z.strictObject({
  attachmentIds: z.array(id()).min(1, 'Upload a photo or PDF first.').max(12),
});
export type EvidenceBody = z.input<typeof evidenceBody>;
export const taskBody = z.strictObject({
  kind: z.enum(TASK_KINDS, 'Choose corrective or preventive.'),
  description: said(5, 'what is to be done', 2000),
  ownerId: z.number('Choose who owns it.').int().positive('Choose who owns it.'),
  dueOn: isoDate,
});
export type TaskBody = z.input<typeof taskBody>;
export const taskDoneBody = z.strictObject({ note: said(3, 'what was done', 1000) });
export const verifyBody = z.strictObject({
  effective: z.boolean('Say whether it worked.'),
  note: said(5, 'what the check found', 2000),
});
export type VerifyBody = z.input<typeof verifyBody>;
export const closeCaBody = z.strictObject({ reason: said(5, 'why it can close', 1000), password: signaturePassword });
export type CloseCaBody = z.input<typeof closeCaBody>;

export const caListQuery = z.strictObject({ ...paging, state: z.enum(CA_STATES).optional() });
export type CaListQuery = z.output<typeof caListQuery>;
export const taskListQuery = z.strictObject({
  ...paging,
  owner: z.enum(['me', 'anyone']).default('anyone'),
  overdue: z.enum(['true', 'false']).optional(),
});
export type TaskListQuery = z.output<typeof taskListQuery>;

// ——— replies ———

export type TaskJson = {
  id: number;
  correctiveAction: { number: string; title: string };
  kind: TaskKind;
  description: string;
  owner: { id: number; name: string };
  dueOn: string;
  overdue: boolean;
  doneAt: string | null;
  doneBy: string | null;
  doneNote: string | null;
};

export type CaSummaryJson = {
  number: string;
  title: string;
  state: CaState;
  openedAt: string;
  openedBy: string;
  tasks: { total: number; done: number; overdue: number };
  sources: string[];
};

export type CaSourceJson =
  | { kind: 'ncr'; number: string; state: string; subject: string; description: string }
  | { kind: 'claim'; number: string; state: string; unit: string; symptom: string };

export type CaContainmentJson = {
  kind: 'hold' | 'field_action';
  number: string;
  state: string;
  subject: string;
  note: string;
  addedBy: string;
  addedAt: string;
};

export type CaJson = CaSummaryJson & {
  problem: string;
  containment: string;
  rootCause: string;
  verificationDueOn: string | null;
  verification: { effective: boolean; note: string; by: string; at: string } | null;
  closedBy: string | null;
  closedAt: string | null;
  sourceList: CaSourceJson[];
  team: { userId: number; name: string; role: string; teamRole: string }[];
  containmentLinks: CaContainmentJson[];
  evidence: AttachmentJson[];
  actions: TaskJson[];
  signatures: { printedName: string; meaning: string; reason: string; signedAt: string }[];
  /** What still stands between it and closure, in words; empty when it can be closed. */
  closeBlockers: string[];
};

export type PersonOption = { id: number; name: string; role: string };
