/** Request schemas for field work and sharing: field log, attachments, share links, import and export. */
import { z } from 'zod';
import { portSettingsObjectSchema, type PortSettings } from '../frame/port-settings';
import { templateSchema } from '../frame/template';
import { presetsSchema, savedSequenceSchema, marksProblems, valuesProblems } from './commands';
import { emailSchema } from './platform';
import { bridgesSchema, DEVICE_ROLES, LINK_KINDS, MEMBER_ROLES, portSettingsInputSchema, versionSchema, wiringRowSchema } from './vault';
import { busPlanSchema, memberDropM, memberTapPorts } from './bus-plan';

export const FIELD_LOG_KINDS = ['replacement', 'verified', 'found-different'] as const;
export const ATTACHMENT_KINDS = ['manual', 'photo', 'config'] as const;
export const ATTACHMENT_OWNERS = ['device', 'machine'] as const;
export const SHARE_SCOPES = ['machine', 'site'] as const;

export const FIELD_LOG_LABELS: Record<(typeof FIELD_LOG_KINDS)[number], string> = {
  replacement: 'Replacement unit fitted',
  verified: 'Communication verified',
  'found-different': 'Settings found different on site',
};

const text = (max: number) => z.string().trim().max(max, `Use at most ${max} characters.`);
const id = z.string().min(1, 'Choose a record.').max(64);

// ---- field log ----
const photoIds = z.array(id).max(10, 'At most 10 photos per entry.').default([]);

/**
 * Port settings as found on site: any of a port's settings (the frame engine's schema, each one optional and
 * without its default), unknown fields refused. Frame rules are the vault's own and not found on a device.
 */
export type FoundPortSettings = { [K in Exclude<keyof PortSettings, 'frameRules'>]?: PortSettings[K] };
const foundShape: z.ZodRawShape = Object.fromEntries(Object.entries(portSettingsObjectSchema.shape)
  .filter(([key]) => key !== 'frameRules')
  .map(([key, field]) => [key, (field instanceof z.ZodDefault ? field.removeDefault() : field).optional()]));
export const foundPortSettingsSchema = (z.strictObject(foundShape) as unknown as z.ZodType<FoundPortSettings>)
  .refine((s) => Object.values(s).some((v) => v !== undefined), 'Give at least one setting you found, or leave the port out.');

/**
 * What a phone adds to an entry written offline and sent later (docs/decisions/017-offline-cards.md): when the work
 * was done (checked against the server's clock by `doneAtProblem`, src/lib/field/done-at.ts) and the phone's own
 * key for the entry, so a resend after a lost answer writes nothing twice.
 */
const offlineFields = {
  doneAt: z.iso.datetime({ offset: true, error: 'Give the time the work was done as an ISO time, such as 2026-05-01T08:00:00Z.' }).optional(),
  clientKey: z.string().regex(/^[A-Za-z0-9_-]{8,64}$/, 'A client key is 8 to 64 letters, digits, - or _.').optional(),
};

export const fieldLogCreateSchema = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('replacement'),
    newSerialNumber: text(120).min(1, 'Enter the serial number of the unit fitted.'),
    appliedVersion: z.number({ error: 'Say which revision of the settings was loaded.' }).int().positive('Revisions start at 1.'),
    /** Firmware of the unit fitted, when read off it. */
    firmware: text(60).default(''),
    note: text(4000).default(''),
    photoIds,
    ...offlineFields,
  }),
  z.strictObject({
    kind: z.literal('verified'), note: text(4000).default(''), photoIds, ...offlineFields,
    /** A configuration-file attachment of the device (the live link's exchangeLog), claimed by the entry like its photos. */
    exchangeLogId: id.optional(),
  }),
  z.strictObject({
    kind: z.literal('found-different'),
    foundSettings: text(2000).min(1, 'Describe what you found set on the device.'),
    /** What the unit's plate or display says, when it differs from the record. */
    serialNumber: text(120).default(''),
    firmware: text(60).default(''),
    /** One port's settings as found, for an engineer to apply to that port. */
    port: z.strictObject({ portId: id, settings: foundPortSettingsSchema }).optional(),
    note: text(4000).default(''),
    photoIds,
    ...offlineFields,
  }),
], { error: 'Choose what happened: replacement, verified or found-different.' });
export type FieldLogCreate = z.infer<typeof fieldLogCreateSchema>;

// ---- proposals ----
export const PROPOSAL_STATUSES = ['pending', 'accepted', 'declined'] as const;
export const PROPOSAL_STATUS_LABELS: Record<(typeof PROPOSAL_STATUSES)[number], string> = {
  pending: 'Waiting for review',
  accepted: 'Accepted into the record',
  declined: 'Declined',
};
export const proposalListSchema = z.strictObject({
  deviceId: id.optional(),
  status: z.enum([...PROPOSAL_STATUSES, 'all'], { error: 'Choose pending, accepted, declined or all.' }).default('pending'),
});
/** Accepting: the device record version reviewed, and the named port's version when the proposal carries port settings. */
export const proposalAcceptSchema = z.strictObject({ version: versionSchema, portVersion: versionSchema.optional() });
export const proposalDeclineSchema = z.strictObject({ note: text(2000).min(1, 'Say why, so the technician knows what to do next.') });

export const annotationCreateSchema = z.strictObject({ note: text(2000).min(1, 'Write the annotation.') });

// ---- attachments ----
export const attachmentFieldsSchema = z.strictObject({
  ownerType: z.enum(ATTACHMENT_OWNERS, { error: 'Attach to a device or a machine.' }),
  ownerId: id,
  kind: z.enum(ATTACHMENT_KINDS, { error: 'Choose manual, photo or config.' }),
  name: z.string().max(300).optional(),
});
export const attachmentListSchema = z.strictObject({ ownerType: z.enum(ATTACHMENT_OWNERS), ownerId: id });

// ---- share links ----
/**
 * A day that exists on the calendar (YYYY-MM-DD; 2027-02-30 or 2027-02-29 is refused, never rolled over
 * into March), or a full ISO 8601 time with `Z` or an offset.
 */
export const dayOrTimeSchema = z.union([z.iso.date(), z.iso.datetime({ offset: true })], {
  error: 'Enter a day that exists, as YYYY-MM-DD (or a full ISO time such as 2027-03-01T17:00:00Z).',
});

export const shareCreateSchema = z.strictObject({
  scopeType: z.enum(SHARE_SCOPES, { error: 'Share a machine or a site.' }),
  scopeId: id,
  label: text(120).default(''),
  /** Last day the link works (YYYY-MM-DD, through the end of that day UTC), or a full ISO time. */
  expiresAt: dayOrTimeSchema.optional(),
});
export const shareEmailSchema = z.strictObject({ to: emailSchema, message: text(1000).default('') });
export const cardEmailSchema = z.strictObject({ deviceId: id, to: emailSchema, message: text(1000).default('') });

// ---- export / import ----
export const EXPORT_FORMAT = 'baudbook-export';
/**
 * The version exports are written in. 2 added the ports' control lines (docs/decisions/013); a version-1 document
 * still imports, its control lines derived from handshake and RS-485 direction.
 */
export const EXPORT_VERSION = 2;
export const EXPORT_VERSIONS_READ = [1, 2] as const;
export const EXPORT_VERSIONS_TEXT = 'versions 1 and 2';
const recordId = z.string().min(1).max(64);

export const exportDocumentSchema = z.strictObject({
  format: z.literal(EXPORT_FORMAT, { error: `format must be "${EXPORT_FORMAT}".` }),
  version: z.union(EXPORT_VERSIONS_READ.map((v) => z.literal(v)), { error: `This server reads ${EXPORT_VERSIONS_TEXT} documents.` }),
  exportedAt: z.iso.datetime({ offset: true, error: 'Not a real time; exports write one like 2026-05-01T08:00:00.000Z.' }),
  source: z.strictObject({ team: text(200), scope: z.enum(['team', 'site']), siteId: recordId.nullable() }),
  sites: z.array(z.strictObject({ id: recordId, name: text(120).min(1), customer: text(120), address: text(300), notes: text(5000) })).max(5000),
  machines: z.array(z.strictObject({ id: recordId, siteId: recordId, name: text(120).min(1), code: text(60), notes: text(5000), plcStringCapacity: z.number().int().min(1).max(65535).nullable().default(null) })).max(20000),
  profiles: z.array(z.strictObject({
    id: recordId, name: text(120).min(1), role: z.enum(DEVICE_ROLES), maker: text(120), model: text(120), notes: text(5000),
    ports: z.array(z.strictObject({ name: text(60).min(1), settings: portSettingsInputSchema, wiring: z.array(wiringRowSchema).max(40), notes: text(5000) })).max(16),
  })).max(5000),
  devices: z.array(z.strictObject({
    id: recordId, machineId: recordId, profileId: recordId.nullable(), tag: text(40).min(1), name: text(120), role: z.enum(DEVICE_ROLES),
    maker: text(120), model: text(120), serialNumber: text(120), firmware: text(60), location: text(200), notes: text(5000),
    // A converter's bridged ports (ids of its ports in this document); exports made before converters have none.
    bridges: bridgesSchema.default([]),
  })).max(100000),
  ports: z.array(z.strictObject({
    id: recordId, deviceId: recordId, name: text(60).min(1), position: z.number().int().min(0), settings: portSettingsInputSchema,
    wiring: z.array(wiringRowSchema).max(40), notes: text(5000),
  })).max(200000),
  links: z.array(z.strictObject({
    id: recordId, machineId: recordId, name: text(120).min(1), kind: z.enum(LINK_KINDS), cableType: text(120),
    cableLengthM: z.number().nonnegative().max(10000).nullable(), notes: text(5000),
    members: z.array(z.strictObject({
      portId: recordId, role: z.enum(MEMBER_ROLES), position: z.number().int().min(0), isEnd: z.boolean().nullable(), unitLoads: z.number().positive().max(32).nullable(),
      // Exports made before the bus planner kept drops have none.
      dropM: memberDropM.default(null), tapPorts: memberTapPorts.default(null),
    })).max(64),
    busPlan: busPlanSchema.nullable().default(null),
  })).max(50000),
  commands: z.array(z.strictObject({
    id: recordId, deviceId: recordId.nullable(), profileId: recordId.nullable(), name: text(120).min(1), purpose: text(500),
    template: templateSchema, fieldValues: z.record(z.string(), z.union([z.string(), z.number(), z.null()])),
    replyTemplate: templateSchema.nullable(), portName: text(60), rawUnits: z.record(z.string(), z.string().max(40)),
    notes: text(5000), movesMachinery: z.boolean(),
    // Exports made before the live link's marks have neither.
    safeToRepeat: z.boolean().default(false), setsUpDevice: z.boolean().default(false),
    // Exports made before presets existed have none.
    presets: presetsSchema.default([]),
    // A sequence: steps refer to commands of the document by their ids here. Absent for single commands.
    sequence: savedSequenceSchema.optional(),
  }).superRefine((c, ctx) => {
    for (const [key, message] of marksProblems(c)) ctx.addIssue({ code: 'custom', path: [key], message });
    c.presets.forEach((p, i) => {
      for (const [key, message] of valuesProblems(c.template, p.values)) ctx.addIssue({ code: 'custom', path: ['presets', i, 'values', key], message: `Preset "${p.name}": ${message}` });
    });
  })).max(100000),
});
export type ExportDocument = z.infer<typeof exportDocumentSchema>;

export const importRequestSchema = z.strictObject({ document: z.unknown(), apply: z.boolean().default(false) });
export const exportQuerySchema = z.strictObject({ siteId: id.optional() });

// ---- CSV ----
export const csvImportSchema = z.strictObject({
  machineId: id,
  csv: z.string().min(1, 'The file is empty.').max(10 * 1024 * 1024, 'CSV files up to 10 MB.'),
  /** Our field name → the CSV column header that holds it. */
  mapping: z.record(z.string().max(40), z.string().max(200)),
  apply: z.boolean().default(false),
  /** Apply the valid rows even when some rows have errors (those rows are left out). */
  skipInvalid: z.boolean().default(false),
});
export type CsvImportRequest = z.infer<typeof csvImportSchema>;

// ---- cards kept on a phone ----
export const KEPT_SCOPES = ['machine', 'site'] as const;
/** At most this many machines and sites kept on one phone, and this many device cards among them. */
export const KEPT_MAX_SCOPES = 50;
export const KEPT_MAX_DEVICES = 300;
/** `GET /api/field/kept?machine=ID&site=ID…`: what the phone keeps (each parameter may repeat). */
export const keptQuerySchema = z.strictObject({
  machine: z.array(id).default([]),
  site: z.array(id).default([]),
}).refine((q) => q.machine.length + q.site.length <= KEPT_MAX_SCOPES, `Keep at most ${KEPT_MAX_SCOPES} machines and sites on one phone.`);
