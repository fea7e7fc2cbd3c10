import type { CREDIT_DECISIONS, CORE_PARTS, DAMAGE, GRADES, SOURCES, TeardownPart } from '../../../shared/schemas/intake';
import type { Party } from '../../../shared/schemas/intake';
import type { Attachment } from '../attachments/upload-photo';
import type { ItemJson } from '../items/types';

/** The teardown as recorded on the core (server/services/teardown.ts). */
export type TeardownRecord = {
  at: string;
  byId: number;
  kept: { serial: string; kind: TeardownPart; position: string | null }[];
  scrapped: { kind: TeardownPart; position?: string; reason: string }[];
  discardedByRule: string[];
  notes: string;
};

export type CoreReceipt = {
  castingNumber: string;
  idNumber: string | null;
  source: (typeof SOURCES)[number];
  customer: Party | null;
  supplier: Party | null;
  sourceReference: string | null;
  receivedOn: string;
  receivedBy: string;
  condition: {
    complete: boolean;
    missing: (typeof CORE_PARTS)[number][];
    damage: (typeof DAMAGE)[number][];
  };
  grade: (typeof GRADES)[number] | null;
  accepted: boolean;
  rejectReason: string | null;
  creditDecision: (typeof CREDIT_DECISIONS)[number] | null;
  creditReason: string | null;
  notes: string;
};

export type CoreDetail = ItemJson & { receipt: CoreReceipt; teardown: TeardownRecord | null; photos: Attachment[] };

/** A recent core with the same number, as GET /api/cores/duplicates and a 409 possible_duplicate list them. */
export type Duplicate = {
  serial: string;
  castingNumber: string;
  idNumber: string | null;
  receivedOn: string;
  accepted: boolean;
};
