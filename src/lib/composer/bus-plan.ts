/**
 * The bus page's poll cycle panel, in pure code: what the page gives it (the master, the other members with their
 * library commands' byte counts) and the poll each member starts with.
 */
import type { PortSettings } from '../frame/port-settings';

export interface PlanCommand {
  id: string;
  name: string;
  requestBytes: number;
  /** null: the command expects no reply. */
  replyBytes: number | null;
}

export interface PlanMember {
  portId: string;
  /** "DRV-201 RS-485" */
  label: string;
  role: 'master' | 'slave' | 'peer';
  settings: PortSettings;
  commands: PlanCommand[];
}

export interface BusPlan {
  master: PlanMember;
  members: PlanMember[];
  /** The link's cable length, taken as the trunk. */
  trunkM: number | null;
  /** Codes of the link check's findings (the panel leaves out what the link check already says). */
  linkCodes: string[];
}

/** A poll as the panel's inputs hold it: text as typed. */
export interface PollDraft {
  portId: string;
  /** The library command it came from, '' when the byte counts are typed. */
  commandId: string;
  label: string;
  requestBytes: string;
  replyBytes: string;
  responseMs: string;
  perCycle: string;
}

/** Modbus Application Protocol V1.1b3 §6.3: reading 10 holding registers is an 8-byte request and a 25-byte reply in RTU. */
export const MODBUS_READ_10 = { name: 'read 10 registers', requestBytes: 8, replyBytes: 25 } as const;

/**
 * The first poll of a member: its first library command with a reply (else its first command), else on Modbus RTU
 * a read of 10 registers, else blank byte counts. The response time starts as the member port's turnaround delay
 * (a device's port keeps its own answer delay there); once a poll per cycle.
 */
export function firstPoll(m: PlanMember): PollDraft {
  const base = { portId: m.portId, responseMs: String(m.settings.turnaroundDelayMs), perCycle: '1' };
  const cmd = m.commands.find((c) => c.replyBytes !== null) ?? m.commands[0];
  if (cmd) return { ...base, commandId: cmd.id, label: `${m.label}: ${cmd.name}`, requestBytes: String(cmd.requestBytes), replyBytes: String(cmd.replyBytes ?? 0) };
  if (m.settings.protocol === 'modbus-rtu') {
    return { ...base, commandId: '', label: `${m.label}: ${MODBUS_READ_10.name}`, requestBytes: String(MODBUS_READ_10.requestBytes), replyBytes: String(MODBUS_READ_10.replyBytes) };
  }
  return { ...base, commandId: '', label: m.label, requestBytes: '', replyBytes: '' };
}
