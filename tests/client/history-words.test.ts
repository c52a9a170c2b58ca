/** The history list in words: labels, values and link ends instead of field names, ids and JSON. */
import { describe, expect, it } from 'vitest';
import { historyFieldLabel, historySummary, historyValue } from '../../src/components/vault/history-words';

describe('history in words', () => {
  it('names fields as their forms do', () => {
    expect(historyFieldLabel('device', 'serialNumber')).toBe('Serial number');
    expect(historyFieldLabel('device', 'location')).toBe('Location in the cabinet');
    expect(historyFieldLabel('site', 'notes')).toBe('Notes');
    expect(historyFieldLabel('link', 'cableLengthM')).toBe('Cable length (m)');
    expect(historyFieldLabel('port', 'settings.parity')).toBe('Parity');
    expect(historyFieldLabel('port', 'settings.rs485Direction')).toBe('Direction control');
  });

  it('shows port setting values with the port form’s words', () => {
    expect(historyValue('port', 'settings.parity', 'even')).toBe('Even');
    expect(historyValue('port', 'settings.rs485Direction', 'auto')).toBe('Automatic');
    expect(historyValue('port', 'settings.baud', 19200)).toBe('19200');
    expect(historyValue('port', 'settings.termination', true)).toBe('on');
  });

  it('shows a device role in words and an id by the name it was given', () => {
    expect(historyValue('device', 'role', 'drive')).toBe('Drive');
    expect(historyValue('device', 'machineId', 'mach_1', { mach_1: 'Churn line' })).toBe('Churn line');
    expect(historyValue('device', 'serialNumber', '')).toBe('—');
  });

  it("lists a link's members by their ends' names, never port ids or JSON", () => {
    const names = { p1: 'PLC-200 X3', p2: 'DRV-203 RS-485' };
    const members = [{ portId: 'p1', role: 'master', isEnd: true, unitLoads: null }, { portId: 'p2', role: 'slave', isEnd: false, unitLoads: null }];
    const text = historyValue('link', 'members', members, names);
    expect(text).toBe('PLC-200 X3 (master, cable end); DRV-203 RS-485 (slave)');
    expect(text).not.toContain('p1');
    expect(text).not.toContain('{');
    expect(historyValue('link', 'members', [{ portId: 'gone', role: 'slave' }], names)).toBe('a port no longer on this machine (slave)');
    expect(historyValue('link', 'members', [], names)).toBe('none');
  });

  it('rebuilds the engine’s “Changed …” summary with labels and keeps other summaries', () => {
    expect(historySummary('device', 'Changed serialNumber, firmware', [{ field: 'serialNumber' }, { field: 'firmware' }])).toBe('Changed Serial number, Firmware');
    expect(historySummary('port', 'Changed settings.baud, settings.parity', [{ field: 'settings.baud' }, { field: 'settings.parity' }])).toBe('Changed Baud rate, Parity');
    const five = ['name', 'customer', 'address', 'notes', 'x'].map((field) => ({ field }));
    expect(historySummary('site', 'Changed name, customer, address and 2 more', five)).toBe('Changed Site name, Customer, Address and 2 more');
    expect(historySummary('port', 'Copied settings from DRV-201 RS-485', [{ field: 'settings.baud' }])).toBe('Copied settings from DRV-201 RS-485');
    expect(historySummary('device', 'Restored version 1', [{ field: 'location' }])).toBe('Restored version 1');
  });
});
