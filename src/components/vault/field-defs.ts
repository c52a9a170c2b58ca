/** Field lists for the vault's edit forms (labels in the words integrators use). */
import { DEVICE_ROLES, DEVICE_ROLE_LABELS, LINK_KINDS } from '../../lib/schemas/vault';
import type { FieldDef } from './EntityForm';

export const roleOptions = DEVICE_ROLES.map((r) => ({ value: r, label: DEVICE_ROLE_LABELS[r] }));
export const kindOptions = LINK_KINDS.map((k) => ({ value: k, label: k === 'rs485-bus' ? 'RS-485 bus (one master, addressed devices)' : 'Point-to-point' }));

export const siteFieldDefs: FieldDef[] = [
  { name: 'name', label: 'Site name' },
  { name: 'customer', label: 'Customer' },
  { name: 'address', label: 'Address' },
  { name: 'notes', label: 'Notes (access, contacts, permits)', kind: 'textarea' },
];

export const machineFieldDefs: FieldDef[] = [
  { name: 'name', label: 'Machine, line or cell' },
  { name: 'code', label: 'Customer’s number', hint: 'e.g. L2 or the asset number' },
  { name: 'plcStringCapacity', label: 'PLC STRING length (characters)', kind: 'number', hint: 'As the PLC program declares its command strings, e.g. 80 for STRING[80]; the composer measures commands against it' },
  { name: 'notes', label: 'Notes', kind: 'textarea' },
];

export const deviceFieldDefs: FieldDef[] = [
  { name: 'tag', label: 'Tag', hint: 'As on the drawings, e.g. DRV-201' },
  { name: 'name', label: 'Name' },
  { name: 'role', label: 'Role', kind: 'select', options: roleOptions },
  { name: 'maker', label: 'Maker' },
  { name: 'model', label: 'Model' },
  { name: 'serialNumber', label: 'Serial number' },
  { name: 'firmware', label: 'Firmware' },
  { name: 'location', label: 'Location in the cabinet' },
  { name: 'notes', label: 'Notes', kind: 'textarea' },
];

export const linkFieldDefs: FieldDef[] = [
  { name: 'name', label: 'Link name' },
  { name: 'kind', label: 'Kind', kind: 'select', options: kindOptions },
  { name: 'cableType', label: 'Cable type' },
  { name: 'cableLengthM', label: 'Cable length (m)', kind: 'number' },
  { name: 'notes', label: 'Notes', kind: 'textarea' },
];

export const profileFieldDefs: FieldDef[] = [
  { name: 'name', label: 'Profile name' },
  { name: 'role', label: 'Role', kind: 'select', options: roleOptions },
  { name: 'maker', label: 'Maker' },
  { name: 'model', label: 'Model' },
  { name: 'notes', label: 'Notes (where the settings live on the device)', kind: 'textarea' },
];
