import { describe, expect, it } from 'vitest';
import { indexMoveTemplate, jogTemplate } from '~/lib/composer/demo';
import { plcFileForCommands } from '~/lib/frame/plc-code';
import { runSt } from './st-eval';

const pouText = (file: string, name: string) => {
  const start = file.indexOf(`FUNCTION ${name} :`);
  return file.slice(start, file.indexOf('END_FUNCTION', start) + 'END_FUNCTION'.length);
};

describe("a device's .st file", () => {
  const file = plcFileForCommands('DRV-501 Seamer drive', [
    { name: 'Index 45°', template: indexMoveTemplate, presets: [{ name: 'Jog 1° one way', values: { angle: 1, speed: 0.05 } }] },
    { name: 'Jog', template: jogTemplate('+'), presets: [] },
    { name: 'Jog', template: jogTemplate('-'), presets: [] },
    { name: 'Note', template: { version: 1, segments: [{ type: 'text', id: 't', name: 'note', label: 'Note', case: 'as-is' }] }, presets: [] },
  ], 'L1_');

  it('has the caution once, then a POU per command and preset, names unique', () => {
    expect(file.match(/CAUTION/g)).toHaveLength(1);
    expect(file).toContain('FUNCTION L1_Index_45 : STRING(');
    expect(file).toContain('FUNCTION L1_Index_45_Jog_1_one_way : STRING(');
    expect(file).toContain('FUNCTION L1_Jog : STRING(');
    expect(file).toContain('FUNCTION L1_Jog_2 : STRING(');
  });

  it('names a command it cannot generate, with the reason', () => {
    expect(file).toContain('(* "Note" is not generated: Text field "Note" has no maxLength');
  });

  it('each POU runs on its own', () => {
    expect(runSt(pouText(file, 'L1_Index_45_Jog_1_one_way'), { address: 3, accel: 500000, decel: 500000 }).result).toBe('3!IDX:+100/R180000/F180000/S1800\r');
    expect(runSt(pouText(file, 'L1_Jog_2'), { address: 1, angle: -100 }).result).toBe('1!JOG:-100\r');
  });
});
