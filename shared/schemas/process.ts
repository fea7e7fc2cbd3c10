import { z } from 'zod';
import { enteredPassword } from './auth.js';
import { decimal, id, isoDateTime, text } from './common.js';
import { UNIT_SYMBOLS } from '../domain/units.js';
import { LOT_KINDS } from './build.js';

/**
 * The plant's own process definition: part kinds, stages, routes (versions under change control),
 * characteristics and the casting numbers each family accepts.
 */

const name = (what: string) =>
  text(`Enter ${what}.`).trim().min(2, `Enter ${what} of at least 2 characters.`).max(80, 'At most 80 characters.');

/** Lower-case words joined by underscores: `oil_pump`. */
export const partKindCode = text('Enter a code.')
  .trim()
  .toLowerCase()
  .regex(/^[a-z][a-z0-9_]{1,19}$/, 'Use 2–20 lower-case letters, digits or underscores, starting with a letter.');

/** Lower-case words joined by dashes: `block-crack`, `main-bore`. */
export const processCode = text('Enter a code.')
  .trim()
  .toLowerCase()
  .regex(/^[a-z][a-z0-9-]{1,39}$/, 'Use 2–40 lower-case letters, digits or dashes, starting with a letter.');

export const familyCode = text('Choose an engine family.').trim().toUpperCase().min(1).max(20);

export const partKindBody = z.strictObject({
  code: partKindCode,
  name: name('a name'),
  serialized: z.boolean().default(true),
});
export type PartKindBody = z.output<typeof partKindBody>;

export const updatePartKindBody = z
  .strictObject({
    name: name('a name').optional(),
    serialized: z.boolean().optional(),
    retired: z.boolean().optional(),
  })
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');

const caution = text()
  .trim()
  .max(300, 'At most 300 characters.')
  .transform((s) => s || null);

const stageFields = {
  name: name('a name'),
  caution: caution.nullable().default(null),
  hazardous: z.boolean().default(false),
  /** The unit's run test, which the release gate requires passed. */
  runTest: z.boolean().default(false),
  description: text().trim().max(500, 'At most 500 characters.').default(''),
};
const needsCaution = (s: { hazardous?: boolean; caution?: string | null }) => !s.hazardous || !!s.caution;
const CAUTION_NEEDED = {
  message: 'Work that can hurt someone needs a caution for the station screen.',
  path: ['caution'],
};

/** A run test is of a built unit: the release gate reads it on the long block. */
export const RUN_TEST_ON_UNIT = { message: 'Only a long block’s stage can be its run test.', path: ['runTest'] };

export const stageBody = z
  .strictObject({ code: processCode, partKind: partKindCode, ...stageFields })
  .refine(needsCaution, CAUTION_NEEDED)
  .refine((s) => !s.runTest || s.partKind === 'long_block', RUN_TEST_ON_UNIT);
export type StageBody = z.output<typeof stageBody>;

export const updateStageBody = z
  .strictObject({
    name: stageFields.name.optional(),
    caution: caution.nullable().optional(),
    hazardous: z.boolean().optional(),
    runTest: z.boolean().optional(),
    description: stageFields.description.optional(),
    retired: z.boolean().optional(),
  })
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');
export type UpdateStageBody = z.output<typeof updateStageBody>;

export const routeStepBody = z.strictObject({
  stage: processCode,
  required: z.boolean().default(true),
  /** A part that fails this step goes back to this earlier stage of the same route. */
  reworkTo: processCode.nullable().default(null),
});

export const routeDraftBody = z
  .strictObject({
    family: familyCode,
    partKind: partKindCode,
    note: text().trim().max(500, 'At most 500 characters.').default(''),
    steps: z.array(routeStepBody).min(1, 'A route has at least one stage.').max(40, 'At most 40 stages.'),
  })
  .superRefine((r, ctx) => {
    const seen = new Map<string, number>();
    r.steps.forEach((s, i) => {
      if (seen.has(s.stage)) {
        ctx.addIssue({ code: 'custom', path: ['steps', i, 'stage'], message: 'A stage comes once in a route.' });
      }
      seen.set(s.stage, i);
      if (s.reworkTo !== null) {
        const at = seen.get(s.reworkTo);
        if (at === undefined || at >= i) {
          ctx.addIssue({
            code: 'custom',
            path: ['steps', i, 'reworkTo'],
            message: 'Rework goes back to an earlier stage of this route.',
          });
        }
      }
    });
  });
export type RouteDraftBody = z.output<typeof routeDraftBody>;

export const routeListQuery = z.strictObject({ family: familyCode, partKind: partKindCode.optional() });

export const approveChangeBody = z.strictObject({
  reason: text('Say why.').trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
  password: enteredPassword('Enter your password to sign.'),
  effectiveFrom: isoDateTime().optional(),
});
export type ApproveChangeBody = z.output<typeof approveChangeBody>;

export const retireBody = z.strictObject({
  reason: text('Say why.').trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
});

export const moveRouteBody = z.strictObject({
  routeId: id('Choose a route version.'),
  reason: text('Say why.').trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
});

export const POSITION_SCHEMES = ['part', 'cylinder', 'main', 'crankpin', 'valve', 'deck'] as const;
const word = text()
  .trim()
  .toLowerCase()
  .regex(/^[a-z][a-z0-9-]{0,19}$/, 'Use a short lower-case word.');
export const positionSchemeBody = z.discriminatedUnion('per', [
  z.strictObject({ per: z.literal('part') }),
  z.strictObject({
    per: z.literal('cylinder'),
    depths: z.array(word).max(6).optional(),
    axes: z.array(word).max(4).optional(),
  }),
  z.strictObject({ per: z.literal('main'), axes: z.array(word).max(4).optional() }),
  z.strictObject({ per: z.literal('crankpin') }),
  z.strictObject({
    per: z.literal('valve'),
    valves: z
      .array(z.enum(['in', 'ex']))
      .max(2)
      .optional(),
  }),
  z.strictObject({ per: z.literal('deck'), points: z.number().int().min(1).max(20).optional() }),
]);

export const CHARACTERISTIC_KINDS = ['variable', 'attribute'] as const;

const physical = decimal(14, 6, 'Enter a number.').min(-1e6).max(1e6).nullable().default(null);

export const characteristicBody = z
  .strictObject({
    stage: processCode,
    code: processCode,
    name: text('Enter a name.').trim().min(2, 'Enter a name of at least 2 characters.').max(120),
    kind: z.enum(CHARACTERISTIC_KINDS, 'Measured or pass/fail?'),
    unit: z.enum(UNIT_SYMBOLS, 'Choose a unit from the list.').nullable().default(null),
    resolution: decimal(12, 6, 'Enter the resolution.').positive('More than 0.').max(1000).nullable().default(null),
    positions: positionSchemeBody.default({ per: 'part' }),
    critical: z.boolean().default(false),
    optional: z.boolean().default(false),
    defectCode: text().trim().toUpperCase().max(20).nullable().default(null),
    gaugeKinds: z.array(text().trim().min(1).max(40)).max(10, 'At most 10 gauge kinds.').default([]),
    /** The purchased part whose size class must match this characteristic's at build. */
    matesWith: z.enum(LOT_KINDS, 'Choose a purchased part from the list.').nullable().default(null),
    physicalMin: physical,
    physicalMax: physical,
    help: text().trim().max(300, 'At most 300 characters.').default(''),
  })
  .superRefine((c, ctx) => {
    if (c.kind === 'variable' && !c.unit) {
      ctx.addIssue({ code: 'custom', path: ['unit'], message: 'A measured characteristic has a unit.' });
    }
    if (c.kind === 'variable' && c.resolution === null) {
      ctx.addIssue({ code: 'custom', path: ['resolution'], message: 'Enter the resolution readings are taken to.' });
    }
    if (c.physicalMin !== null && c.physicalMax !== null && c.physicalMin >= c.physicalMax) {
      ctx.addIssue({
        code: 'custom',
        path: ['physicalMax'],
        message: 'The highest possible value is above the lowest.',
      });
    }
  });
export type CharacteristicBody = z.output<typeof characteristicBody>;

export const castingNumberBody = z.strictObject({
  castingNumber: text('Enter the casting number.')
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9./-]{0,39}$/, 'Use letters, digits, dots, dashes or slashes (at most 40).'),
  partKind: partKindCode.default('block'),
  note: text().trim().max(200, 'At most 200 characters.').default(''),
});
export type CastingNumberBody = z.output<typeof castingNumberBody>;

export type PartKindJson = { code: string; name: string; serialized: boolean; builtIn: boolean; retired: boolean };

export type ProcessStageJson = {
  id: number;
  code: string;
  name: string;
  partKind: string;
  caution: string | null;
  hazardous: boolean;
  runTest: boolean;
  description: string;
  retired: boolean;
  stations: string[];
};

export type RouteStepJson = {
  position: number;
  stage: string;
  stageName: string;
  required: boolean;
  reworkTo: string | null;
};

export type RouteVersionJson = {
  id: number;
  family: string;
  partKind: string;
  version: number;
  status: 'draft' | 'approved' | 'superseded' | 'discarded' | 'retired';
  inForce: boolean;
  note: string;
  createdBy: string | null;
  approvedBy: string | null;
  approvedAt: string | null;
  approvalReason: string | null;
  effectiveFrom: string | null;
  supersededAt: string | null;
  parts: number;
  steps: RouteStepJson[];
};

export type CharacteristicJson = {
  id: number;
  stage: string;
  code: string;
  name: string;
  kind: string;
  unit: string | null;
  resolution: number | null;
  positions: z.output<typeof positionSchemeBody>;
  critical: boolean;
  optional: boolean;
  defectCode: string | null;
  gaugeKinds: string[];
  matesWith: string | null;
  retired: boolean;
};

export type CastingNumberJson = {
  id: number;
  family: string;
  castingNumber: string;
  partKind: string;
  note: string;
  retired: boolean;
};
