/**
 * One command against the PLC STRING it is built in. Widest case of the demo index move worked out by hand:
 * address "31" (2) + "!IDX:" (5) + angle "-36000" (6) + "/R" (2) + accel 50 rev/s² × 36,000 = "1800000" (7) + "/F" (2)
 * + decel "1800000" (7) + "/S" (2) + speed 10 rev/s × 36,000 = "360000" (6) + CR (1) = 40 characters; the saved values
 * (`1!IDX:+4500/R180000/F180000/S18000` + CR) make 35.
 */
import { describe, expect, it } from 'vitest';
import { indexMoveTemplate } from '../../src/lib/composer/demo';
import { assembleFrame, plcStringFit } from '../../src/lib/frame';

const saved = { address: 1, angle: 45, accel: 5, decel: 5, speed: 0.5 };
const length = assembleFrame(indexMoveTemplate, saved).bytes.length;

describe('a command against the PLC STRING', () => {
  it('gives its length now and at its widest', () => {
    expect(length).toBe(35);
    expect(plcStringFit(indexMoveTemplate, length, 80)).toEqual({ capacity: 80, length: 35, longestLength: 40, findings: [] });
    expect(plcStringFit(indexMoveTemplate, length, 40).findings).toEqual([]);
  });

  it('is an error when the widest case does not fit, though the values given do', () => {
    const [f, ...rest] = plcStringFit(indexMoveTemplate, length, 38).findings;
    expect(rest).toEqual([]);
    expect(f).toMatchObject({ severity: 'error', code: 'plc-string-may-overflow' });
    expect(f!.message).toContain('is 40 characters, more than the 38 the PLC string holds (the values given make 35)');
  });

  it('is an error when the string itself is too long, marking the bytes past the end', () => {
    expect(plcStringFit(indexMoveTemplate, length, 30).findings).toEqual([
      expect.objectContaining({ severity: 'error', code: 'plc-string-too-long', range: [30, 35] }),
    ]);
  });

  it('says nothing when the capacity is not recorded', () => {
    expect(plcStringFit(indexMoveTemplate, length, null)).toEqual({ capacity: null, length: 35, longestLength: 40, findings: [] });
  });
});
