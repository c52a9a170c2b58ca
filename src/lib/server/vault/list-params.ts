/**
 * Query-string parsers of the vault's list endpoints, built once at module level (zod compiles a
 * schema on its first parse). The CSV export reads the same filters through the same parsers.
 */
import { z } from 'zod';
import { DEVICE_ROLES, ENTITY_TYPES } from '../../schemas/vault';
import { RECORD_TYPES } from '../../../db/schema';
import { listParser } from './records';
import { idFilter } from './params';
import { SITE_SORTS } from './sites';
import { MACHINE_SORTS } from './machines';
import { DEVICE_SORTS, parseDeviceCursor, type DeviceListOptions } from './device-list-sql';
import { Invalid } from '../errors';
import { LINK_SORTS } from './links';
import { PROFILE_SORTS } from './profiles';

const text = z.string().max(100).optional();
const role = z.enum(DEVICE_ROLES).optional();

export const siteListParams = listParser(SITE_SORTS, 'name', { q: text });
export const machineListParams = listParser(MACHINE_SORTS, 'name', { siteId: idFilter, q: text });
const deviceListQuery = listParser(DEVICE_SORTS, 'tag', { machineId: idFilter, siteId: idFilter, role, q: text, after: z.string().max(1000).optional() });

/** The device list's query string; `after` is a page's `next` cursor, given back as it came (docs/api.md). */
export function deviceListParams(url: URL): DeviceListOptions {
  const { after, ...rest } = deviceListQuery(url);
  if (after === undefined) return rest;
  const cursor = parseDeviceCursor(after);
  if (!cursor) throw new Invalid('after: not a cursor of this list', { fields: { after: 'Give back the `next` value of the previous page, unchanged.' } });
  return { ...rest, after: cursor };
}
export const linkListParams = listParser(LINK_SORTS, 'name', { machineId: idFilter, q: text });
export const profileListParams = listParser(PROFILE_SORTS, 'name', { q: text, role });
export const revisionListParams = listParser(['createdAt'], 'createdAt', { entityType: z.enum(ENTITY_TYPES).optional(), entityId: idFilter });
export const trashListParams = listParser(['deletedAt'], 'deletedAt', { type: z.enum(RECORD_TYPES).optional() });
/** Ports have no list endpoint of their own; the CSV export lists them by device tag. */
export const portExportParams = listParser(['tag'], 'tag', { deviceId: idFilter, machineId: idFilter });
