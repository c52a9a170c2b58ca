/** A command's save meeting a 409: compared field by field and segment by segment; only my changes are re-sent. */
import { describe, expect, it } from 'vitest';
import { compareVersions } from '../../src/lib/client/conflict';
import type { Segment, Template } from '../../src/lib/frame/template';
import { changedDraftFields, commandShape, mergedDraft, orderRows, segmentIsLeaf } from '../../src/components/composer/command-conflict';
import { commandPartLabel, commandPartValue } from '../../src/components/composer/command-parts';
import type { CommandDraft } from '../../src/components/composer/types';

const lit = (id: string, bytes: string): Segment => ({ type: 'literal', id, bytes });
const tpl = (...segments: Segment[]): Template => ({ version: 1, segments });
const speed = { type: 'integer', id: 'f1', name: 'speed', label: 'Speed', pad: 'zero', sign: 'negative' } as Segment;
const end = { type: 'terminator', id: 'end', bytes: '0D' } as Segment;

const draft = (over: Partial<CommandDraft> = {}): CommandDraft => ({
  name: 'Set speed', purpose: '', notes: '', movesMachinery: true, safeToRepeat: false, setsUpDevice: false,
  template: tpl(lit('s1', '53'), speed, end), fieldValues: { speed: '100' }, replyTemplate: null, portName: 'RS-485', rawUnits: {}, presets: [],
  ...over,
});

function conflict(base: CommandDraft, mine: CommandDraft, theirs: CommandDraft) {
  const c = compareVersions(commandShape(base), commandShape(mine), commandShape(theirs), segmentIsLeaf);
  const next = mergedDraft(c.merged, base, mine, theirs);
  return { ...c, next, body: changedDraftFields(theirs, next) };
}

describe('saving a command', () => {
  it('sends only the fields changed since it was opened', () => {
    const base = draft();
    expect(changedDraftFields(base, draft({ notes: 'ramp first' }))).toEqual({ notes: 'ramp first' });
    expect(changedDraftFields(base, draft())).toEqual({});
  });
});

describe('a command conflict', () => {
  it('merges their segment edit with mine and re-sends only the template and my value', () => {
    const base = draft();
    const mine = draft({ template: tpl(lit('s1', '53'), speed, lit('s2', '2C'), end), fieldValues: { speed: '250' } });
    const theirs = draft({ template: tpl(lit('s1', '73'), speed, end), name: 'Set speed (drive 2)' });
    const { rows, next, body } = conflict(base, mine, theirs);
    expect(rows.map((r) => [r.path.join('/'), r.theirsChanged, r.mineChanged, r.clash])).toEqual([
      ['name', true, false, false],
      ['template/s1', true, false, false],
      ['template/s2', false, true, false],
      ['fieldValues/speed', false, true, false],
    ]);
    expect(next.template).toEqual(tpl(lit('s1', '73'), speed, lit('s2', '2C'), end));
    expect(next.name).toBe('Set speed (drive 2)');
    expect(body).toEqual({ template: next.template, fieldValues: { speed: '250' } });
  });

  it('says which segment both changed, by its place and title', () => {
    const base = draft();
    const mine = draft({ template: tpl(lit('s1', '54'), speed, end) });
    const theirs = draft({ template: tpl(lit('s1', '55'), speed, end) });
    const { rows, next } = conflict(base, mine, theirs);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ path: ['template', 's1'], clash: true });
    expect(commandPartLabel(rows[0]!.path, mine, theirs)).toBe('Request segment #1 (Literal s1)');
    expect(commandPartValue(rows[0]!.path, rows[0]!.theirs)).toBe('Literal s1 U');
    expect(commandPartValue(rows[0]!.path, rows[0]!.mine)).toBe('Literal s1 T');
    expect(next.template.segments[0]).toEqual(lit('s1', '54'));
  });

  it('shows a move of segments as an order row and keeps my order on re-apply', () => {
    const base = draft();
    const mine = draft({ template: tpl(speed, lit('s1', '53'), end) });
    const theirs = draft({ notes: 'checked on site' });
    const { rows, next, body } = conflict(base, mine, theirs);
    expect(rows.map((r) => r.path[0])).toEqual(['notes']);
    const order = orderRows(base, mine, theirs);
    expect(order).toHaveLength(1);
    expect(order[0]).toMatchObject({ mineChanged: true, theirsChanged: false, clash: false });
    expect(commandPartLabel(order[0]!.path, mine)).toBe('Order of the request segments');
    expect(commandPartValue(order[0]!.path, order[0]!.mine, mine)).toBe('#1 Field Speed, #2 Literal s1, #3 Terminator');
    expect(body).toEqual({ template: tpl(speed, lit('s1', '53'), end) });
    expect(next.notes).toBe('checked on site');
  });

  it('compares a reply template switched on as one part', () => {
    const base = draft();
    const mine = draft({ replyTemplate: tpl(lit('r1', '06')) });
    const theirs = draft({ purpose: 'Line speed' });
    const { rows, body } = conflict(base, mine, theirs);
    expect(rows.find((r) => r.path[0] === 'replyTemplate')).toMatchObject({ path: ['replyTemplate'], mineChanged: true, clash: false });
    expect(body).toEqual({ replyTemplate: tpl(lit('r1', '06')) });
  });

  it('takes bytes 0x00, 0x7F, 0x80 and 0xFF through the merge unchanged', () => {
    const base = draft();
    const bytes = lit('s3', '00 7F 80 FF');
    const mine = draft({ template: tpl(lit('s1', '53'), speed, bytes, end) });
    const theirs = draft({ template: tpl(lit('s1', '53'), speed, lit('s4', '2C'), end) });
    const { next } = conflict(base, mine, theirs);
    // Both added a segment after the field: mine goes right after it, theirs follows.
    expect(next.template.segments.map((s) => (s.type === 'literal' ? s.bytes : s.id))).toEqual(['53', 'f1', '00 7F 80 FF', '2C', 'end']);
  });
});
