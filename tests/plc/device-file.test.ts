import { describe, expect, it } from 'vitest';
import { indexMoveTemplate, jogTemplate } from '~/lib/composer/demo';
import { plcCodeForSequence, plcFileForCommands, plcFileForDevices } from '~/lib/frame/plc-code';
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

// The demo jog syntax (our own): `1!JOG:` + the signed angle in steps (° × 100) + CR; worked by hand from the template.
describe("a sequence's code", () => {
  const steps = [
    { template: jogTemplate('+'), values: { address: 1, angle: 1 } },
    { template: jogTemplate('-'), values: { address: 2, angle: -2.5 } },
  ];

  it('sent as one string: one POU joining the steps, every field an input, then one with the saved values fixed', () => {
    const file = plcFileForCommands('DRV-501', [{ name: 'Jog out and back', template: { version: 1, segments: [] }, presets: [], sequence: { mode: 'one-string', delayMs: 0, steps } }]);
    expect(file.match(/CAUTION/g)).toHaveLength(1);
    expect(runSt(pouText(file, 'Jog_out_and_back_as_saved'), {}).result).toBe('1!JOG:+100\r2!JOG:-250\r');
    const inputs = runSt(pouText(file, 'Jog_out_and_back'), { address: 7, angle: 1000, address_2: 8, angle_2: -1 });
    expect(inputs.result).toBe('7!JOG:+1000\r8!JOG:-1\r');
  });

  it('sent as separate sends: one POU per step, in order, with the pause named', () => {
    const r = plcCodeForSequence('Jog out and back', { mode: 'separate', delayMs: 40, steps: steps.map((s) => ({ template: s.template, fixed: s.values })) }, { prefix: 'L1_' });
    if (!r.ok) throw new Error(r.error.message);
    expect(r.value.names).toEqual(['L1_Jog_out_and_back_step_1', 'L1_Jog_out_and_back_step_2']);
    expect(r.value.code.match(/CAUTION/g)).toHaveLength(1);
    expect(r.value.code).toContain('pausing 40 ms between sends');
    expect(runSt(pouText(r.value.code, 'L1_Jog_out_and_back_step_1'), {}).result).toBe('1!JOG:+100\r');
    expect(runSt(pouText(r.value.code, 'L1_Jog_out_and_back_step_2'), {}).result).toBe('2!JOG:-250\r');
  });

  it('a step the generator cannot follow refuses the whole sequence, naming the step; a gap is named in the file', () => {
    const note = { version: 1 as const, segments: [{ type: 'text' as const, id: 't', name: 'note', label: 'Note', case: 'as-is' as const }] };
    const r = plcCodeForSequence('S', { mode: 'separate', delayMs: 0, steps: [{ template: jogTemplate('+') }, { template: note }] });
    expect(r.ok ? '' : r.error.message).toMatch(/^Step 2: Text field "Note" has no maxLength/);
    const file = plcFileForCommands('D', [{ name: 'Broken', template: { version: 1, segments: [] }, presets: [], sequence: { gap: 'Step 1: the command "Jog" is in the trash; restore it or replace the step.' } }]);
    expect(file).toContain('(* "Broken" is not generated: Step 1: the command "Jog" is in the trash');
  });
});

describe("a machine's .st file", () => {
  const cmds = [{ name: 'Jog', template: jogTemplate('+'), presets: [] }];
  const file = plcFileForDevices('Seamer (S1), Brackwater', [{ tag: 'DRV-501', commands: cmds }, { tag: 'DRV-502', commands: cmds }, { tag: '7-AX', commands: cmds }], 'L1');

  it("names each device's POUs after its tag (a dash is a separator), so the same command on two devices stays apart", () => {
    expect(file.match(/CAUTION/g)).toHaveLength(1);
    expect(file).toContain('3 devices, 3 commands');
    expect(file).toContain('FUNCTION L1_DRV_501_Jog : STRING(');
    expect(file).toContain('FUNCTION L1_DRV_502_Jog : STRING(');
    expect(file).toContain('FUNCTION L1_Dev_7_AX_Jog : STRING(');
    expect(runSt(pouText(file, 'L1_DRV_502_Jog'), { address: 4, angle: 5 }).result).toBe('4!JOG:+5\r');
  });
});
