/**
 * The invented demo vault: Fernhollow Integration's customers (a creamery, a tile works, a cannery),
 * with one RS-485 drive bus that has deliberate faults (DRV-203 left at 19200 on a 9600 bus, and answering after
 * 60 ms where the PLC waits only 50 ms) and one sensor bus missing a terminator, for the link check and the poll
 * cycle panel to find; and a PLC's RS-232 port reaching an infeed drive through an RS-232 to RS-485 converter
 * (CV-430) whose link check agrees end to end. Fixed ids: safe to run on every start.
 */
import type { Role } from '../../permissions';
import { DEMO_ACCOUNTS, DEMO_CUSTOMER_TEAM_ID, DEMO_TEAM_ID } from './platform';
import { addDevice, addLink, addMachine, addProfile, addSite, type SeedCtx } from './vault-builders';

const modbus = { interface: 'rs485-2w', baud: 9600, dataBits: 8, parity: 'even', stopBits: 1, rs485Direction: 'auto', protocol: 'modbus-rtu', responseTimeoutMs: 500, turnaroundDelayMs: 5, retries: 2 } as const;
const rs485Pins = [
  { pin: '1', signal: 'D+ (B)', colour: 'white' },
  { pin: '2', signal: 'D- (A)', colour: 'blue' },
  { pin: '3', signal: 'Common', colour: 'black' },
];
const db9 = [
  { pin: '2', signal: 'RXD', colour: 'red' },
  { pin: '3', signal: 'TXD', colour: 'white' },
  { pin: '5', signal: 'GND', colour: 'black' },
];

async function fernhollow(c: SeedCtx) {
  await addProfile(c, 'prof_demo_qd40', 'Quillmoor QD-40 drive', 'drive', 'Quillmoor', 'QD-40', 'Parameters P8.01-P8.05 set the serial port; power-cycle after changing.', [
    { name: 'RS-485', settings: { ...modbus, nodeAddress: null }, wiring: rs485Pins },
  ]);
  await addProfile(c, 'prof_demo_ts9', 'Tallowby TS-9 platform scale', 'scale', 'Tallowby', 'TS-9', 'Continuous output off; replies to "W" with the gross weight.', [
    { name: 'COM1', settings: { interface: 'rs232', baud: 9600, dataBits: 7, parity: 'even', stopBits: 1, protocol: 'ascii', frameRules: { terminator: '0D 0A', byteSet: 'printable', letterCase: 'upper', maxLength: 32, addressField: 'address' } }, wiring: db9 },
  ]);
  await addProfile(c, 'prof_demo_or7', 'Orrinstall OR-7 scanner', 'reader', 'Orrinstall', 'OR-7', 'Sends each code followed by CR.', [
    { name: 'Host port', settings: { interface: 'rs232', baud: 115200, protocol: 'ascii', frameRules: { terminator: '0D', byteSet: 'printable', letterCase: 'any', addressField: 'address' } } },
  ]);

  await addSite(c, 'site_demo_creamery', 'Brackwater Creamery', 'Brackwater Dairy Cooperative', 'Mill Road, Brackwater', 'Gate code at the security lodge. Ask for the shift lead before touching line 2.');
  await addSite(c, 'site_demo_tiles', 'Calloway Tile Works', 'Calloway Ceramics', 'Unit 4, Kilnside Estate');
  await addSite(c, 'site_demo_cannery', 'Pellory Cannery', 'Pellory Foods', 'Harbour Quay 12');

  await addMachine(c, 'mach_demo_churn', 'site_demo_creamery', 'Butter churn line 2', 'L2', 'Three churn drives on one Modbus bus from the line PLC.');
  await addMachine(c, 'mach_demo_press', 'site_demo_creamery', 'Cheese press cell', 'C4');
  await addMachine(c, 'mach_demo_kiln', 'site_demo_tiles', 'Kiln conveyor', 'K1');
  await addMachine(c, 'mach_demo_seamer', 'site_demo_cannery', 'Seamer line 1', 'S1');

  // Butter churn line 2: PLC-200 masters a 9600 8-E-1 bus with its response timeout cut to 50 ms; DRV-203 was
  // swapped last week and came up at 19200, with a 60 ms reply delay (its port's turnaround delay).
  await addDevice(c, { id: 'dev_demo_plc200', machineId: 'mach_demo_churn', tag: 'PLC-200', name: 'Line 2 controller', role: 'plc', maker: 'Vellmar Systems', model: 'VX-220', serialNumber: 'VX22-0048812', firmware: '3.1.4', location: 'Cabinet MCC-2, rail A',
    ports: [
      { id: 'port_demo_plc200_x3', name: 'X3 RS-485', settings: { ...modbus, nodeAddress: null, termination: true, bias: true, responseTimeoutMs: 50 }, wiring: rs485Pins, notes: 'Terminator switch S1 on the CPU front.' },
      { id: 'port_demo_plc200_x2', name: 'X2 RS-232', settings: { interface: 'rs232', baud: 9600, dataBits: 7, parity: 'even', stopBits: 1, protocol: 'ascii', frameRules: { terminator: '0D 0A', byteSet: 'printable', letterCase: 'upper', addressField: 'address' } }, wiring: db9 },
    ] });
  for (const [n, addr, baud, end] of [[201, 1, 9600, false], [202, 2, 9600, false], [203, 3, 19200, true]] as const) {
    await addDevice(c, { id: `dev_demo_drv${n}`, machineId: 'mach_demo_churn', tag: `DRV-${n}`, name: `Churn ${n - 200} drive`, role: 'drive', maker: 'Quillmoor', model: 'QD-40', serialNumber: `QD40-77${n}`, firmware: n === 203 ? '2.2.0' : '2.1.7', location: `Cabinet MCC-2, drive bay ${n - 200}`, profileId: 'prof_demo_qd40',
      notes: n === 203 ? 'Replacement unit fitted 2026-11-24.' : '',
      ports: [{ id: `port_demo_drv${n}`, name: 'RS-485', settings: { ...modbus, baud, nodeAddress: addr, termination: end, turnaroundDelayMs: n === 203 ? 60 : 5 }, wiring: rs485Pins }] });
  }
  await addDevice(c, { id: 'dev_demo_scl210', machineId: 'mach_demo_churn', tag: 'SCL-210', name: 'Butter block scale', role: 'scale', maker: 'Tallowby', model: 'TS-9', serialNumber: 'TS9-3391', location: 'Packing table', profileId: 'prof_demo_ts9',
    ports: [{ id: 'port_demo_scl210', name: 'COM1', settings: { interface: 'rs232', baud: 9600, dataBits: 7, parity: 'even', stopBits: 1, protocol: 'ascii', frameRules: { terminator: '0D 0A', byteSet: 'printable', letterCase: 'upper', maxLength: 32, addressField: 'address' } }, wiring: db9 }] });
  await addLink(c, { id: 'link_demo_churn_bus', machineId: 'mach_demo_churn', name: 'Churn drive bus', kind: 'rs485-bus', cableType: 'Shielded twisted pair, 120 Ω', cableLengthM: 45,
    notes: 'Daisy-chained PLC → DRV-201 → DRV-202 → DRV-203.',
    members: [
      { portId: 'port_demo_plc200_x3', role: 'master', isEnd: true, dropM: 0 },
      { portId: 'port_demo_drv201', role: 'slave', isEnd: false, dropM: 0 },
      { portId: 'port_demo_drv202', role: 'slave', isEnd: false, dropM: 0 },
      { portId: 'port_demo_drv203', role: 'slave', isEnd: true, dropM: 0 },
    ],
    // The saved poll plan: a 10-register read of each drive (8 bytes out, 25 back); DRV-203 answers after 60 ms,
    // beyond PLC-200's 50 ms response timeout (the plan keeps the port's timeout), which the panel reports.
    busPlan: {
      polls: [201, 202, 203].map((n) => ({ portId: `port_demo_drv${n}`, label: `DRV-${n} RS-485: read 10 registers`, requestBytes: 8, replyBytes: 25, responseMs: n === 203 ? 60 : 5, perCycle: 1 })),
      targetCycleMs: 250,
      topology: 'daisy-chain',
    } });
  await addLink(c, { id: 'link_demo_scale', machineId: 'mach_demo_churn', name: 'Scale to PLC', kind: 'point-to-point', cableType: 'DB9 null-modem', cableLengthM: 6,
    members: [{ portId: 'port_demo_plc200_x2', role: 'master' }, { portId: 'port_demo_scl210', role: 'slave' }] });

  // Cheese press cell: a scanner on the PLC, and a label printer reached through a serial-over-TCP server.
  await addDevice(c, { id: 'dev_demo_plc300', machineId: 'mach_demo_press', tag: 'PLC-300', name: 'Press cell controller', role: 'plc', maker: 'Vellmar Systems', model: 'VX-120', serialNumber: 'VX12-1130', firmware: '3.0.9', location: 'Cell cabinet',
    ports: [{ id: 'port_demo_plc300_com', name: 'COM', settings: { interface: 'rs232', baud: 115200, protocol: 'ascii' }, wiring: db9 }] });
  await addDevice(c, { id: 'dev_demo_rdr310', machineId: 'mach_demo_press', tag: 'RDR-310', name: 'Mould code reader', role: 'reader', maker: 'Orrinstall', model: 'OR-7', serialNumber: 'OR7-55012', location: 'Press infeed', profileId: 'prof_demo_or7',
    ports: [{ id: 'port_demo_rdr310', name: 'Host port', settings: { interface: 'rs232', baud: 115200, protocol: 'ascii', frameRules: { terminator: '0D', byteSet: 'printable', letterCase: 'any', addressField: 'address' } } }] });
  await addDevice(c, { id: 'dev_demo_prn320', machineId: 'mach_demo_press', tag: 'PRN-320', name: 'Wheel label printer', role: 'printer', maker: 'Kestmoor', model: 'LP-4', serialNumber: 'LP4-2207', location: 'Outfeed',
    ports: [{ id: 'port_demo_prn320', name: 'Serial server', settings: { interface: 'tcp', tcpHost: '10.20.4.31', tcpPort: 4001, baud: 38400, protocol: 'ascii' } }] });
  await addLink(c, { id: 'link_demo_reader', machineId: 'mach_demo_press', name: 'Reader to PLC', kind: 'point-to-point', cableType: 'DB9 straight', cableLengthM: 4,
    members: [{ portId: 'port_demo_plc300_com', role: 'master' }, { portId: 'port_demo_rdr310', role: 'slave' }] });

  // Kiln conveyor: zone temperature sensors on a bus whose far end was never terminated.
  await addDevice(c, { id: 'dev_demo_plc400', machineId: 'mach_demo_kiln', tag: 'PLC-400', name: 'Kiln conveyor controller', role: 'plc', maker: 'Vellmar Systems', model: 'VX-120', serialNumber: 'VX12-1201', location: 'Kiln panel',
    ports: [
      { id: 'port_demo_plc400', name: 'RS-485', settings: { ...modbus, baud: 19200, parity: 'none', stopBits: 2, nodeAddress: null, termination: true, bias: true }, wiring: rs485Pins },
      // Set up for the infeed drive: 9600 8-N-1, sending not held back by CTS, RTS on only while sending with a lead
      // and a tail, so a converter switched by RTS has its driver on for the whole frame.
      { id: 'port_demo_plc400_x2', name: 'X2 RS-232', settings: { interface: 'rs232', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, rtsMode: 'transmit', ctsMode: 'ignore', rtsLeadMs: 2, rtsTailMs: 2, protocol: 'ascii', frameRules: { terminator: '0D', byteSet: 'printable', letterCase: 'upper', addressField: 'address' } }, wiring: db9, notes: 'For the infeed drive, through an RS-232 to RS-485 converter switched by RTS.' },
    ] });
  for (const [n, addr] of [[411, 11], [412, 12]] as const) {
    await addDevice(c, { id: `dev_demo_sns${n}`, machineId: 'mach_demo_kiln', tag: `TT-${n}`, name: `Zone ${n - 410} temperature`, role: 'sensor', maker: 'Fenwray', model: 'TX-2', serialNumber: `TX2-90${n}`, location: `Kiln zone ${n - 410}`,
      ports: [{ id: `port_demo_sns${n}`, name: 'RS-485', settings: { ...modbus, baud: 19200, parity: 'none', stopBits: 2, nodeAddress: addr }, wiring: rs485Pins }] });
  }
  await addLink(c, { id: 'link_demo_kiln_bus', machineId: 'mach_demo_kiln', name: 'Zone sensor bus', kind: 'rs485-bus', cableType: 'Shielded twisted pair', cableLengthM: 80,
    members: [{ portId: 'port_demo_plc400', role: 'master', isEnd: true }, { portId: 'port_demo_sns411', role: 'slave', isEnd: false }, { portId: 'port_demo_sns412', role: 'slave', isEnd: true }] });
  // The infeed drive, reached from the PLC's RS-232 port through a converter whose RS-485 driver is switched by
  // the PLC's RTS: two links, joined by the converter's bridge, that the link check follows end to end.
  await addDevice(c, { id: 'dev_demo_cv430', machineId: 'mach_demo_kiln', tag: 'CV-430', name: 'Infeed line converter', role: 'converter', maker: 'Hollinvar', model: 'HV-485R', serialNumber: 'HV485-20417', location: 'Kiln panel, rail B',
    ports: [
      { id: 'port_demo_cv430_232', name: 'RS-232', settings: { interface: 'rs232', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, protocol: 'ascii' }, wiring: db9 },
      { id: 'port_demo_cv430_485', name: 'RS-485', settings: { interface: 'rs485-2w', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, rtsMode: 'transmit', protocol: 'ascii', termination: true, bias: true }, wiring: rs485Pins, notes: 'Driver switched by RTS from the RS-232 side; termination and bias switches on.' },
    ],
    bridges: [['port_demo_cv430_232', 'port_demo_cv430_485']] });
  await addDevice(c, { id: 'dev_demo_drv440', machineId: 'mach_demo_kiln', tag: 'DRV-440', name: 'Infeed conveyor drive', role: 'drive', maker: 'Quillmoor', model: 'QD-12', serialNumber: 'QD12-30440', location: 'Kiln infeed',
    ports: [{ id: 'port_demo_drv440', name: 'RS-485', settings: { interface: 'rs485-2w', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, rs485Direction: 'auto', nodeAddress: 1, protocol: 'ascii', termination: true }, wiring: rs485Pins }] });
  await addLink(c, { id: 'link_demo_kiln_cv', machineId: 'mach_demo_kiln', name: 'PLC to infeed converter', kind: 'point-to-point', cableType: 'DB9 straight', cableLengthM: 2,
    members: [{ portId: 'port_demo_plc400_x2', role: 'master' }, { portId: 'port_demo_cv430_232', role: 'slave' }] });
  await addLink(c, { id: 'link_demo_kiln_infeed', machineId: 'mach_demo_kiln', name: 'Infeed drive bus', kind: 'rs485-bus', cableType: 'Shielded twisted pair', cableLengthM: 25,
    members: [{ portId: 'port_demo_cv430_485', role: 'master', isEnd: true }, { portId: 'port_demo_drv440', role: 'slave', isEnd: true }] });

  // Seamer line 1: one drive on its own point-to-point RS-485 link, all agreeing.
  await addDevice(c, { id: 'dev_demo_plc500', machineId: 'mach_demo_seamer', tag: 'PLC-500', name: 'Seamer controller', role: 'plc', maker: 'Vellmar Systems', model: 'VX-220', serialNumber: 'VX22-0051007', location: 'Seamer cabinet',
    ports: [{ id: 'port_demo_plc500', name: 'RS-485', settings: { ...modbus, nodeAddress: null, termination: true, bias: true }, wiring: rs485Pins }] });
  await addDevice(c, { id: 'dev_demo_drv501', machineId: 'mach_demo_seamer', tag: 'DRV-501', name: 'Seamer main drive', role: 'drive', maker: 'Quillmoor', model: 'QD-40', serialNumber: 'QD40-80501', location: 'Seamer cabinet', profileId: 'prof_demo_qd40',
    ports: [{ id: 'port_demo_drv501', name: 'RS-485', settings: { ...modbus, nodeAddress: 1, termination: true } , wiring: rs485Pins }] });
  await addLink(c, { id: 'link_demo_seamer', machineId: 'mach_demo_seamer', name: 'Seamer drive link', kind: 'rs485-bus', cableType: 'Shielded twisted pair', cableLengthM: 12,
    members: [{ portId: 'port_demo_plc500', role: 'master' }, { portId: 'port_demo_drv501', role: 'slave' }] });
}

async function brackwater(c: SeedCtx) {
  await addSite(c, 'site_demo_bw_plant', 'Brackwater Creamery', 'Own plant', 'Mill Road, Brackwater');
  await addMachine(c, 'mach_demo_bw_sep', 'site_demo_bw_plant', 'Cream separator', 'SEP-1');
  await addDevice(c, { id: 'dev_demo_bw_plc', machineId: 'mach_demo_bw_sep', tag: 'PLC-S1', name: 'Separator controller', role: 'plc', maker: 'Vellmar Systems', model: 'VX-120', location: 'Separator panel',
    ports: [{ id: 'port_demo_bw_plc', name: 'RS-485', settings: { ...modbus, nodeAddress: null, termination: true, bias: true } }] });
  await addDevice(c, { id: 'dev_demo_bw_drv', machineId: 'mach_demo_bw_sep', tag: 'DRV-S1', name: 'Bowl drive', role: 'drive', maker: 'Quillmoor', model: 'QD-40', location: 'Separator panel',
    ports: [{ id: 'port_demo_bw_drv', name: 'RS-485', settings: { ...modbus, nodeAddress: 1, termination: true } }] });
  await addLink(c, { id: 'link_demo_bw', machineId: 'mach_demo_bw_sep', name: 'Bowl drive link', kind: 'rs485-bus', cableType: 'Shielded twisted pair', cableLengthM: 8,
    members: [{ portId: 'port_demo_bw_plc', role: 'master' }, { portId: 'port_demo_bw_drv', role: 'slave' }] });
}

export async function seedVault(ids: Record<Role, string>): Promise<void> {
  const name = (role: Role) => DEMO_ACCOUNTS.find((a) => a.role === role)!.name;
  await fernhollow({ teamId: DEMO_TEAM_ID, userId: ids.engineer, userName: name('engineer') });
  await brackwater({ teamId: DEMO_CUSTOMER_TEAM_ID, userId: ids.owner, userName: name('owner') });
}
