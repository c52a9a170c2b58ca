/**
 * Value presets: a preset's values over the command's saved values, rendered as a technician copies them.
 * Expected strings and times worked out by hand (45° × 100 steps/° = 4500; 5 rev/s² × 36,000 = 180000) and
 * checked with Python: len('1!IDX:+100/R180000/F180000/S1800\r') = 33 bytes, 33 × 10 bits / 9600 bit/s = 34.375 ms.
 */
import { describe, expect, it } from 'vitest';
import { indexMoveTemplate } from '../../src/lib/composer/demo';
import { presetValues, renderCommandVariants } from '../../src/lib/composer/presets';
import { commandUpdateSchema, presetsSchema } from '../../src/lib/schemas/commands';
import { lineSettingsSchema } from '../../src/lib/frame';

const line = lineSettingsSchema.parse({ baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 });
const saved = { address: 1, angle: 45, accel: 5, decel: 5, speed: 0.5 };
const presets = [
  { name: 'Index one station', values: { angle: 45 } },
  { name: 'Jog 1° one way', values: { angle: 1, speed: 0.05 } },
  { name: 'Jog 1° the other way', values: { angle: -1, speed: 0.05 } },
];

describe('value presets', () => {
  it('lay their values over the saved ones', () => {
    expect(presetValues(saved, presets[1]!)).toEqual({ address: 1, angle: 1, accel: 5, decel: 5, speed: 0.05 });
  });

  it('render the saved values and every preset with PLC literal, hex, bytes and time on the wire', () => {
    const out = renderCommandVariants({ template: indexMoveTemplate, fieldValues: saved, presets }, line);
    expect(out.map((v) => v.preset)).toEqual([null, 'Index one station', 'Jog 1° one way', 'Jog 1° the other way']);
    expect(out[0]).toMatchObject({ plc: "'1!IDX:+4500/R180000/F180000/S18000$0D'", byteCount: 35, problem: null });
    expect(out[0]!.wireMs).toBeCloseTo(36.458333, 5);
    expect(out[2]).toMatchObject({ plc: "'1!IDX:+100/R180000/F180000/S1800$0D'", byteCount: 33, problem: null });
    expect(out[2]!.hex).toBe('31 21 49 44 58 3A 2B 31 30 30 2F 52 31 38 30 30 30 30 2F 46 31 38 30 30 30 30 2F 53 31 38 30 30 0D');
    expect(out[2]!.wireMs).toBeCloseTo(34.375, 6);
    expect(out[3]!.plc).toBe("'1!IDX:-100/R180000/F180000/S1800$0D'");
    // Not a serial line: no time on the wire.
    expect(renderCommandVariants({ template: indexMoveTemplate, fieldValues: saved, presets: [] }, null)[0]!.wireMs).toBeNull();
  });

  it('refuse two presets of one name (letter case aside), more than 20, and values that do not fit the template', () => {
    const twice = presetsSchema.safeParse([{ name: 'Jog', values: {} }, { name: ' jog ', values: {} }]);
    expect(twice.success).toBe(false);
    expect(twice.error!.issues[0]!.message).toMatch(/already named/);
    expect(presetsSchema.safeParse(Array.from({ length: 21 }, (_, i) => ({ name: `P${i}`, values: {} }))).success).toBe(false);
    const bad = commandUpdateSchema.safeParse({ version: 1, template: indexMoveTemplate, presets: [{ name: 'Too far', values: { angle: 400 } }, { name: 'Typo', values: { angel: 1 } }] });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
      ['presets.0.values.angle', 'Preset "Too far": At most 360 °.'],
      ['presets.1.values.angel', 'Preset "Typo": The template has no field named "angel".'],
    ]);
  });
});
