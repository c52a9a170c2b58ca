/**
 * Demo commands on the seamer drive DRV-501, in the demo drive syntax of src/lib/composer/demo.ts
 * (our own invention). The drive gets a service port at 9600 8-N-1 for them. Fixed ids: idempotent.
 */
import { db } from '../../../db/client';
import { command, port } from '../../../db/schema';
import { portSettingsSchema } from '../../frame/port-settings';
import { indexAckTemplate, indexMoveTemplate, jogTemplate, lineAckTemplate, lineSetupTemplate, statusQueryTemplate, statusReplyTemplate } from '../../composer/demo';
import { created } from './vault-builders';
import { DEMO_ACCOUNTS, DEMO_TEAM_ID } from './platform';
import type { Role } from '../../permissions';

export const DEMO_DRIVE_ID = 'dev_demo_drv501';
export const DEMO_SERVICE_PORT = 'Service RS-232';

const servicePort = {
  id: 'port_demo_drv501_svc', name: DEMO_SERVICE_PORT, position: 1,
  settings: portSettingsSchema.parse({ interface: 'rs232', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, protocol: 'ascii', turnaroundDelayMs: 2,
    frameRules: { terminator: '0D', byteSet: 'printable', letterCase: 'upper', maxLength: 64, addressRange: { min: 1, max: 31 }, addressField: 'address' } }),
  wiring: [{ pin: '2', signal: 'RXD', colour: 'red' }, { pin: '3', signal: 'TXD', colour: 'white' }, { pin: '5', signal: 'GND', colour: 'black' }],
  notes: 'Front service socket; ASCII commands, one per carriage return.',
};

const commands = [
  { id: 'cmd_demo_drv501_index', name: 'Index 45°', purpose: 'Index the turret one station (45°) with ramps and speed', template: indexMoveTemplate,
    fieldValues: { address: 1, angle: 45, accel: 5, decel: 5, speed: 0.5 }, replyTemplate: indexAckTemplate, movesMachinery: true,
    rawUnits: { angle: 'steps', accel: 'steps/s²', decel: 'steps/s²', speed: 'steps/s' }, notes: 'Drive set to 36,000 steps per revolution (parameter group 3). Acknowledges with 1=IDX:OK*67 then CR.',
    presets: [
      { name: 'Index one station', values: { angle: 45 } },
      { name: 'Jog 1° one way', values: { angle: 1, speed: 0.05 } },
      { name: 'Jog 1° the other way', values: { angle: -1, speed: 0.05 } },
    ] },
  { id: 'cmd_demo_drv501_jog_fwd', name: 'Jog +1°', purpose: 'Jog forward one degree for setting up', template: jogTemplate('+'), fieldValues: { address: 1, angle: 1 }, movesMachinery: true, rawUnits: { angle: 'steps' }, notes: '' },
  { id: 'cmd_demo_drv501_jog_rev', name: 'Jog −1°', purpose: 'Jog back one degree for setting up', template: jogTemplate('-'), fieldValues: { address: 1, angle: -1 }, movesMachinery: true, rawUnits: { angle: 'steps' }, notes: '' },
  { id: 'cmd_demo_drv501_status', name: 'Status query', purpose: 'Ask the position and state; the answer carries an XOR-8 check', template: statusQueryTemplate,
    fieldValues: { address: 1 }, replyTemplate: statusReplyTemplate, movesMachinery: false, safeToRepeat: true, rawUnits: { position: 'steps' }, notes: 'Example reply: 1=STA:+0004500,R*14 then CR.' },
  { id: 'cmd_demo_drv501_line', name: 'Set service line', purpose: 'Bring a replacement drive from its factory framing to the service port\'s stored settings', template: lineSetupTemplate,
    fieldValues: { address: 1, baud: 9600, parity: 'none', dataBits: 8, stopBits: 1 }, replyTemplate: lineAckTemplate, movesMachinery: false, setsUpDevice: true, rawUnits: {},
    notes: 'The drive acknowledges with 1=LIN:OK*79 then CR at the framing it heard, then changes its own.' },
  // A saved sequence of the two above: the index move (acknowledged), then the status query to see where it arrived.
  { id: 'cmd_demo_drv501_index_report', name: 'Index and report', purpose: 'Index one station, then ask the position to see that the turret arrived',
    template: { version: 1, segments: [] }, fieldValues: {}, movesMachinery: true, rawUnits: {},
    sequence: { mode: 'separate', delayMs: 50, steps: [{ commandId: 'cmd_demo_drv501_index', values: {}, waitForReplyMs: 500 }, { commandId: 'cmd_demo_drv501_status', values: {} }] },
    notes: 'Sent separately: the status query goes 50 ms after the index acknowledgement. The acknowledgement comes when the move starts, so the position may still be on its way.' },
];

export async function seedCommands(ids: Record<Role, string>): Promise<void> {
  const userName = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!.name;
  const userId = ids.engineer;
  await db.insert(port).values({ ...servicePort, teamId: DEMO_TEAM_ID, deviceId: DEMO_DRIVE_ID, updatedBy: userId }).onConflictDoNothing();
  const seed = { teamId: DEMO_TEAM_ID, userId, userName };
  await created(seed, 'port', servicePort.id, servicePort, `Created port ${servicePort.name}`);
  for (const c of commands) {
    const row = { replyTemplate: null, portName: DEMO_SERVICE_PORT, ...c } as unknown as Omit<typeof command.$inferInsert, 'teamId'>;
    await db.insert(command).values({ ...row, teamId: DEMO_TEAM_ID, deviceId: DEMO_DRIVE_ID, updatedBy: userId }).onConflictDoNothing();
    // Revision ids as the first seeds wrote them (moved from command_revision), so seeding again adds nothing.
    await created(seed, 'command', c.id, row, `Created command ${c.name}`, `crev_${c.id}_1`);
  }
}
