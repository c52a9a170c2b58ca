import { describe, expect, test } from 'vitest';
import { firstPoll, type PlanMember } from '~/lib/composer/bus-plan';
import { defaultPortSettings } from '~/lib/frame';

const member = (over: Partial<PlanMember> = {}, settings: Partial<PlanMember['settings']> = {}): PlanMember => ({
  portId: 'p1', label: 'DRV-1 RS-485', role: 'slave', settings: { ...defaultPortSettings, turnaroundDelayMs: 5, ...settings }, commands: [], ...over,
});

describe('firstPoll', () => {
  test('the first library command with a reply, the response time from the port', () => {
    const commands = [{ id: 'c0', name: 'Stop', requestBytes: 5, replyBytes: null }, { id: 'c1', name: 'Status', requestBytes: 6, replyBytes: 14 }];
    expect(firstPoll(member({ commands }))).toEqual({ portId: 'p1', commandId: 'c1', label: 'DRV-1 RS-485: Status', requestBytes: '6', replyBytes: '14', responseMs: '5', perCycle: '1' });
    expect(firstPoll(member({ commands: commands.slice(0, 1) }))).toMatchObject({ commandId: 'c0', requestBytes: '5', replyBytes: '0' });
  });
  test('Modbus RTU without commands: a read of 10 holding registers; other protocols: blank byte counts', () => {
    // Modbus Application Protocol V1.1b3 §6.3: function 03 request is 1 + 1 + 2 + 2 + CRC 2 = 8 bytes; reply 1 + 1 + 1 + 20 + 2 = 25
    expect(firstPoll(member({}, { protocol: 'modbus-rtu' }))).toMatchObject({ commandId: '', requestBytes: '8', replyBytes: '25' });
    expect(firstPoll(member())).toMatchObject({ commandId: '', label: 'DRV-1 RS-485', requestBytes: '', replyBytes: '' });
  });
});
