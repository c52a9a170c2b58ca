import { describe, expect, it } from 'vitest';
import { commandRequest, simulatedCommands, type LibraryCommand } from '../../src/components/live/library';
import { indexAckTemplate, indexMoveTemplate } from '../../src/lib/composer/demo';

const index: LibraryCommand = {
  id: 'idx', name: 'Index 45°', movesMachinery: true, safeToRepeat: false, setsUpDevice: false, template: indexMoveTemplate, replyTemplate: indexAckTemplate, portName: 'Service RS-232',
  fieldValues: { address: 1, angle: 45, accel: 5, decel: 5, speed: 0.5 },
  presets: [{ name: 'Jog 1° one way', values: { angle: 1, speed: 0.05 } }],
};
const text = (b: Uint8Array) => String.fromCharCode(...b);

describe('the live link request of a library command', () => {
  it('sends the saved values, or a preset laid over them', () => {
    expect(commandRequest(index, null)).toMatchObject({ label: 'Index 45°', ok: true });
    expect(text(commandRequest(index, null).bytes)).toBe('1!IDX:+4500/R180000/F180000/S18000\r');
    // 1° = 100 steps; 0.05 rev/s × 36,000 = 1800 steps/s.
    expect(text(commandRequest(index, 'Jog 1° one way').bytes)).toBe('1!IDX:+100/R180000/F180000/S1800\r');
    expect(commandRequest(index, 'Jog 1° one way').label).toBe('Index 45°: Jog 1° one way');
    // An unknown preset sends the saved values.
    expect(text(commandRequest(index, 'gone').bytes)).toBe('1!IDX:+4500/R180000/F180000/S18000\r');
  });

  it('gives the simulator the templates only', () => {
    expect(simulatedCommands([index])).toEqual([{ id: 'idx', name: 'Index 45°', template: indexMoveTemplate, replyTemplate: indexAckTemplate }]);
  });
});
