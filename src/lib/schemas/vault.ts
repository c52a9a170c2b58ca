/** Request schemas for the settings vault, shared by the forms (islands) and the API routes. */
import { z } from 'zod';
import { portSettingsObjectSchema, defaultPortSettings, withControlLines } from '../frame/port-settings';
import { frameRulesSchema, defaultFrameRules } from '../frame/frame-rules';
import { busPlanSchema, memberDropM, memberTapPorts } from './bus-plan';

// Duplicated from the DB schema module so the browser bundle does not pull in drizzle.
export const DEVICE_ROLES = ['plc', 'drive', 'scale', 'reader', 'printer', 'sensor', 'hmi', 'converter', 'other'] as const;
export const LINK_KINDS = ['point-to-point', 'rs485-bus'] as const;
export const MEMBER_ROLES = ['master', 'slave', 'peer'] as const;
export const ENTITY_TYPES = ['site', 'machine', 'device', 'port', 'link', 'profile'] as const;

export const DEVICE_ROLE_LABELS: Record<(typeof DEVICE_ROLES)[number], string> = {
  plc: 'PLC', drive: 'Drive', scale: 'Scale', reader: 'Reader', printer: 'Printer', sensor: 'Sensor', hmi: 'HMI', converter: 'Converter', other: 'Other',
};

const text = (max: number) => z.string().trim().max(max, `Use at most ${max} characters.`);
const required = (max: number, what: string) => text(max).min(1, `Enter ${what}.`);
const id = z.string().min(1, 'Choose a record.').max(64);
/** The version the edit was based on (from the record as loaded). */
export const versionSchema = z.number({ error: 'Send the version you edited.' }).int().positive();

/**
 * Port settings as sent by a client: the frame engine's schema, with unknown fields refused at every level, and
 * the control-line keys filled from the older ones (or the other way round) before the check.
 */
export const portSettingsInputSchema = withControlLines(
  portSettingsObjectSchema.safeExtend({ frameRules: frameRulesSchema.strict().default(defaultFrameRules) }).strict(),
);

export const wiringRowSchema = z.strictObject({ pin: text(20), signal: text(40), colour: text(40) });

// ---- sites ----
const siteFields = { name: required(120, 'a site name'), customer: text(120).default(''), address: text(300).default(''), notes: text(5000).default('') };
export const siteCreateSchema = z.strictObject(siteFields);
export const siteUpdateSchema = z.strictObject({ version: versionSchema, ...partial(siteFields) });

// ---- machines ----
const machineFields = {
  name: required(120, 'a machine name'), code: text(60).default(''), notes: text(5000).default(''),
  /** Characters a STRING of the machine's PLC holds; null = not recorded. */
  plcStringCapacity: z.number().int('A whole number of characters.').min(1, 'At least 1 character.').max(65535, 'At most 65,535 characters.').nullable().default(null),
};
export const machineCreateSchema = z.strictObject({ siteId: id, ...machineFields });
export const machineUpdateSchema = z.strictObject({ version: versionSchema, siteId: id.optional(), ...partial(machineFields) });

// ---- ports ----
const portFields = {
  name: required(60, 'a port name'),
  settings: portSettingsInputSchema.default(defaultPortSettings),
  wiring: z.array(wiringRowSchema).max(40, 'At most 40 wiring rows.').default([]),
  notes: text(5000).default(''),
};
export const portInputSchema = z.strictObject(portFields);

/**
 * How port names compare where two on one device must differ: the letter case of A–Z is ignored, exactly as
 * SQLite's NOCASE collation of the unique index on (device, name) does; other letters compare as written.
 * Imports use the same key, so whatever the vault holds, its own export imports again.
 */
export const nameKey = (name: string) => name.replace(/[A-Z]/g, (c) => c.toLowerCase());

/** A device's or profile's list of ports: at most `max`, names unique by `nameKey`. */
const portList = (max: number, what: string) =>
  z
    .array(portInputSchema)
    .max(max, `At most ${max} ports per ${what}.`)
    .superRefine((ports, ctx) => {
      const seen = new Set<string>();
      ports.forEach((p, i) => {
        const key = nameKey(p.name);
        if (seen.has(key)) ctx.addIssue({ code: 'custom', path: [i, 'name'], message: 'Another port here already has this name (letter case aside).' });
        seen.add(key);
      });
    });
export const portCreateSchema = z.strictObject({ deviceId: id, ...portFields });
export const portUpdateSchema = z.strictObject({ version: versionSchema, ...partial(portFields) });

// ---- devices ----
const deviceFields = {
  tag: required(40, 'a tag (e.g. DRV-201)'),
  name: text(120).default(''),
  role: z.enum(DEVICE_ROLES, { error: 'Choose a role.' }).default('other'),
  maker: text(120).default(''),
  model: text(120).default(''),
  serialNumber: text(120).default(''),
  firmware: text(60).default(''),
  location: text(200).default(''),
  notes: text(5000).default(''),
};
export const deviceCreateSchema = z.strictObject({
  machineId: id,
  /** Start from a team profile: its ports (unless `ports` is given) and role, maker and model (unless given). */
  profileId: id.nullable().optional(),
  ...deviceFields,
  role: z.enum(DEVICE_ROLES, { error: 'Choose a role.' }).optional(),
  ports: portList(16, 'device').optional(),
});
/**
 * A converter's bridged ports: pairs of two of its own port ids, each port in one pair at most (whether the ports
 * are the device's and the device a converter, the service checks).
 */
export const bridgesSchema = z
  .array(z.tuple([id, id], { error: 'A bridge is a pair of two port ids.' }), { error: 'Send the bridges as a list of port-id pairs.' })
  .max(8, 'At most 8 bridges on one converter.')
  .superRefine((pairs, ctx) => {
    const seen = new Set<string>();
    pairs.forEach(([a, b], i) => {
      if (a === b) ctx.addIssue({ code: 'custom', path: [i], message: 'A bridge joins two different ports; pick the port on the other side.' });
      else if (seen.has(a) || seen.has(b)) ctx.addIssue({ code: 'custom', path: [i], message: 'A port can be in one bridge only; remove it from the other pair first.' });
      seen.add(a);
      seen.add(b);
    });
  });
export const deviceUpdateSchema = z.strictObject({ version: versionSchema, machineId: id.optional(), ...partial(deviceFields), bridges: bridgesSchema.optional() });

// ---- links ----
export const linkMemberSchema = z.strictObject({
  portId: id,
  role: z.enum(MEMBER_ROLES, { error: 'Choose master, slave or peer.' }),
  isEnd: z.boolean().nullable().optional(),
  unitLoads: z.number().positive('Unit loads are above 0.').max(32).nullable().optional(),
  /** Its drop (stub) cable, m, and the ports on its tap; on an update, absent keeps what the member has. */
  dropM: memberDropM.optional(),
  tapPorts: memberTapPorts.optional(),
});
const members = z
  .array(linkMemberSchema)
  .max(64, 'At most 64 members on one link.')
  .refine((m) => new Set(m.map((x) => x.portId)).size === m.length, { message: 'A port can join a link only once.' });
const linkFields = {
  name: required(120, 'a link name'),
  kind: z.enum(LINK_KINDS, { error: 'Choose point-to-point or RS-485 bus.' }),
  cableType: text(120).default(''),
  cableLengthM: z.number().nonnegative('Length cannot be negative.').max(10_000, 'At most 10 000 m.').nullable().default(null),
  notes: text(5000).default(''),
  members: members.default([]),
  /** What the master polls (RS-485 bus planner); null: no plan. */
  busPlan: busPlanSchema.nullable().default(null),
};
export const linkCreateSchema = z.strictObject({ machineId: id, ...linkFields });
export const linkUpdateSchema = z.strictObject({ version: versionSchema, ...partial(linkFields) });

// ---- profiles ----
const profileFields = {
  name: required(120, 'a profile name'),
  role: deviceFields.role,
  maker: text(120).default(''),
  model: text(120).default(''),
  notes: text(5000).default(''),
  ports: portList(16, 'profile').default([]),
};
export const profileCreateSchema = z.strictObject(profileFields);
export const profileUpdateSchema = z.strictObject({ version: versionSchema, ...partial(profileFields) });
/** Save an existing device (its role, maker, model and ports) as a team profile. */
export const profileFromDeviceSchema = z.strictObject({ name: required(120, 'a profile name') });

// ---- copy settings ----
const endpoint = z.strictObject({ kind: z.enum(['device', 'port']), id });
export const copySettingsSchema = z.strictObject({
  source: endpoint,
  target: endpoint,
  /** Also copy node address and TCP host/port (off by default: two devices on one bus need different addresses). */
  includeAddress: z.boolean().default(false),
  /** Also copy the wiring rows. */
  includeWiring: z.boolean().default(false),
  /** false: answer the differences only; true: write them (needs `basedOn`). */
  apply: z.boolean().default(false),
  /** Target port id → version seen in the preview; a changed port answers 409. */
  basedOn: z.record(z.string(), versionSchema).optional(),
});

// ---- revisions, deletes ----
export const restoreRevisionSchema = z.strictObject({ version: versionSchema });

// ---- lists ----
export const listQuerySchema = z.strictObject({
  page: z.coerce.number().int().min(1, 'Pages start at 1.').default(1),
  pageSize: z.coerce.number().int().min(1).max(200, 'At most 200 rows per page.').default(50),
  sort: z.string().max(40).optional(),
  dir: z.enum(['asc', 'desc'], { error: 'dir is asc or desc.' }).default('asc'),
});

/** Every field optional and without its default, for PATCH bodies (absent = unchanged). */
function partial<T extends Record<string, z.ZodType>>(fields: T): { [K in keyof T]: z.ZodOptional<T[K]> } {
  const out: Record<string, z.ZodType> = {};
  for (const [k, v] of Object.entries(fields)) out[k] = (v instanceof z.ZodDefault ? (v.def.innerType as z.ZodType) : v).optional();
  return out as { [K in keyof T]: z.ZodOptional<T[K]> };
}

export type SiteCreate = z.infer<typeof siteCreateSchema>;
export type MachineCreate = z.infer<typeof machineCreateSchema>;
export type DeviceCreate = z.infer<typeof deviceCreateSchema>;
export type PortInput = z.infer<typeof portInputSchema>;
export type LinkCreate = z.infer<typeof linkCreateSchema>;
export type LinkMemberInput = z.infer<typeof linkMemberSchema>;
export type ProfileCreate = z.infer<typeof profileCreateSchema>;
export type CopySettings = z.infer<typeof copySettingsSchema>;

// ---- edit forms (the editable fields of each record, without parents, version or nested lists) ----
export const siteFormSchema = z.strictObject(siteFields);
export const machineFormSchema = z.strictObject(machineFields);
export const deviceFormSchema = z.strictObject(deviceFields);
export const linkFormSchema = z.strictObject({ name: linkFields.name, kind: linkFields.kind, cableType: linkFields.cableType, cableLengthM: linkFields.cableLengthM, notes: linkFields.notes });
export const profileFormSchema = z.strictObject({ name: profileFields.name, role: profileFields.role, maker: profileFields.maker, model: profileFields.model, notes: profileFields.notes });
