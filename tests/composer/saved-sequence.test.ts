/**
 * Saved sequences resolved against the library: references take their command's template as it is now, step
 * values over the command's saved ones, and a step whose command is in the trash or purged is a named gap that
 * takes no bytes. The field card's rendering of a sequence. Demo drive syntax (src/lib/composer/demo.ts, our own
 * invention); expected bytes worked out with Python (`b'1!JOG:+100\r'.hex(' ').upper()`, …), times as
 * len(s) * 10 / 9600 * 1000 ms at 9600 8-N-1.
 */
import { describe, expect, test } from 'vitest';
import { assembleSaved, describeSteps, referencedIds, type SavedSequence, type StepCommand } from '~/lib/composer/saved-sequence';
import { jogTemplate, statusQueryTemplate, statusReplyTemplate } from '~/lib/composer/demo';
import { cardCommand } from '~/lib/field/card';
import { portSettingsSchema } from '~/lib/frame';

const jog: StepCommand = { id: 'cmd_jog', name: 'Jog +1°', template: jogTemplate('+'), fieldValues: { address: 1, angle: 1 }, replyTemplate: null, isSequence: false, trashed: false };
const status: StepCommand = { id: 'cmd_sta', name: 'Status query', template: statusQueryTemplate, fieldValues: { address: 1 }, replyTemplate: statusReplyTemplate, isSequence: false, trashed: false };
const library = new Map([jog, status].map((c) => [c.id, c]));
const lookup = (id: string) => library.get(id);
const seq = (steps: SavedSequence['steps'], mode: SavedSequence['mode'] = 'one-string'): SavedSequence => ({ mode, delayMs: 0, steps });
const port = portSettingsSchema.parse({ frameRules: { terminator: '0D', byteSet: 'printable', letterCase: 'upper' } });

describe('resolving steps', () => {
  test('a reference takes its command\'s template and saved values, the step\'s values on top', () => {
    // python3: b'1!JOG:+200\r1?STA*48\r' → 20 bytes
    const s = assembleSaved(seq([{ commandId: 'cmd_jog', values: { angle: 2 } }, { commandId: 'cmd_sta', values: {} }]), lookup, { settings: port });
    expect(s.notations.iecLiteral).toBe("'1!JOG:+200$0D1?STA*48$0D'");
    expect(s.byteCount).toBe(20);
    expect(s.findings).toEqual([]);
    expect(s.info.map((i) => [i.name, i.state])).toEqual([['Jog +1°', 'ok'], ['Status query', 'ok']]);
    expect(s.steps.map((x) => x.expectsReply)).toEqual([undefined, true]);
  });

  test('a command in the trash, purged, or itself a sequence: a named gap, no bytes, one error finding', () => {
    const gone = new Map(library);
    gone.set('cmd_jog', { ...jog, trashed: true });
    gone.set('cmd_seq', { ...jog, id: 'cmd_seq', name: 'Other sequence', isSequence: true });
    const q = seq([{ commandId: 'cmd_sta', values: {} }, { commandId: 'cmd_jog', values: {} }, { commandId: 'cmd_none', values: {} }, { commandId: 'cmd_seq', values: {} }]);
    const s = assembleSaved(q, (id) => gone.get(id), { settings: port });
    expect(s.ok).toBe(false);
    expect(s.info.map((i) => [i.state, i.gap])).toEqual([
      ['ok', undefined],
      ['trash', 'Step 2: the command "Jog +1°" is in the trash; restore it or replace the step.'],
      ['purged', 'Step 3: its command was purged from the trash; replace the step or remove it.'],
      ['sequence', 'Step 4: "Other sequence" is itself a sequence; a step must be a single command. Replace the step.'],
    ]);
    expect(s.findings.map((f) => [f.code, f.step])).toEqual([['step-command-missing', 1], ['step-command-missing', 2], ['step-command-missing', 3]]);
    // python3: len(b'1?STA*48\r') = 9; the gaps add nothing
    expect(s.steps.map((x) => [x.start, x.end])).toEqual([[0, 9], [9, 9], [9, 9], [9, 9]]);
    expect(describeSteps(q, (id) => gone.get(id)).map((i) => i.name)).toEqual(['Status query', 'Jog +1°', '(purged command)', 'Other sequence']);
    expect(referencedIds(q)).toEqual(['cmd_sta', 'cmd_jog', 'cmd_none', 'cmd_seq']);
  });

  test('inline steps keep their own template and reply; an empty inline step and no steps stay findings, not throws', () => {
    const s = assembleSaved(seq([{ template: jogTemplate('-'), values: { angle: -1 }, replyTemplate: statusReplyTemplate }]), lookup);
    expect(s.notations.iecLiteral).toBe("'1!JOG:-100$0D'");
    expect(s.info[0]).toEqual({ index: 0, kind: 'inline', commandId: null, name: 'Inline step', state: 'ok' });
    expect(s.steps[0]!.expectsReply).toBe(true);
    expect(assembleSaved(seq([]), lookup).findings.map((f) => f.code)).toEqual(['empty-frame']);
    const raw = assembleSaved(seq([{ template: { version: 1, segments: [{ type: 'literal', id: 'x', bytes: '00 7F 80 FF' }] }, values: {} }]), lookup);
    expect(raw.notations.hex).toBe('00 7F 80 FF');
  });
});

describe('the field card', () => {
  const ports = [{ name: 'Service RS-232', settings: port }];
  const base = { id: 'cmd_q', name: 'Jog and ask', purpose: '', template: { version: 1 as const, segments: [] }, fieldValues: {}, presets: [], portName: 'Service RS-232', movesMachinery: true };

  test('one string: the whole string once, with the steps named', () => {
    const c = cardCommand({ ...base, sequence: seq([{ commandId: 'cmd_jog', values: {} }, { commandId: 'cmd_sta', values: {} }]) }, ports, lookup);
    expect(c.steps).toEqual(['Jog +1°', 'Status query']);
    // python3: 20 × 10 / 9600 × 1000 = 20.833333 ms
    expect(c.sends).toEqual([{ preset: null, plc: "'1!JOG:+100$0D1?STA*48$0D'", hex: '31 21 4A 4F 47 3A 2B 31 30 30 0D 31 3F 53 54 41 2A 34 38 0D', byteCount: 20, wireMs: 20.833333, problem: null }]);
  });

  test('separate sends: each step\'s own string; a gap is the problem of its step', () => {
    const c = cardCommand({ ...base, sequence: seq([{ commandId: 'cmd_jog', values: {} }, { commandId: 'cmd_gone', values: {} }], 'separate') }, ports, lookup);
    expect(c.sends.map((s) => [s.preset, s.plc, s.byteCount, s.wireMs, s.problem])).toEqual([
      ['Step 1 · Jog +1°', "'1!JOG:+100$0D'", 11, 11.458333, null],
      ['Step 2 · (purged command)', "''", 0, 0, 'Step 2: its command was purged from the trash; replace the step or remove it.'],
    ]);
    expect(c.steps![1]).toMatch(/^Step 2: its command was purged/);
  });
});
