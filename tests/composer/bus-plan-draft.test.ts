import { describe, expect, test } from 'vitest';
import type { BusPlan, PlanMember } from '~/lib/composer/bus-plan';
import { draftOf, dropsOf, planOf, saveBody, shapeOf, storedDrops } from '~/lib/composer/bus-plan-draft';
import { busPlanSchema } from '~/lib/schemas/bus-plan';
import { linkMemberSchema } from '~/lib/schemas/vault';
import { defaultPortSettings } from '~/lib/frame';

const member = (portId: string, over: Partial<PlanMember> = {}): PlanMember => ({
  portId, label: `${portId} RS-485`, role: 'slave', settings: { ...defaultPortSettings, protocol: 'modbus-rtu', turnaroundDelayMs: 5 }, commands: [], ...over,
});
const plan: BusPlan = {
  master: member('plc', { role: 'master', settings: { ...defaultPortSettings, protocol: 'modbus-rtu', responseTimeoutMs: 50, retries: 2 } }),
  members: [member('d1', { commands: [{ id: 'c1', name: 'Status', requestBytes: 6, replyBytes: 14 }] }), member('d2')],
  trunkM: 45,
  linkCodes: [],
};
const noDrops = [{ portId: 'plc', dropM: null, tapPorts: null }, { portId: 'd1', dropM: null, tapPorts: null }, { portId: 'd2', dropM: null, tapPorts: null }];

describe('draftOf', () => {
  test('without a saved plan every member starts with its first poll; timeout and retries are the master port\'s', () => {
    const { draft, dropped } = draftOf(plan, { busPlan: null, members: noDrops });
    expect(dropped).toBe(0);
    expect(draft.polls.map((p) => [p.portId, p.commandId, p.requestBytes, p.replyBytes])).toEqual([['d1', 'c1', '6', '14'], ['d2', '', '8', '25']]);
    expect(draft).toMatchObject({ timeout: '50', retries: '2', target: '', topology: '', drops: {} });
  });

  test('a saved plan comes back as typed; polls of ports no longer on the bus and commands no longer in the library are left out', () => {
    const busPlan = {
      polls: [
        { portId: 'd2', label: 'Read', requestBytes: 8, replyBytes: 25, responseMs: 60, perCycle: 2 },
        { portId: 'gone', requestBytes: 8, replyBytes: 25, responseMs: 5, perCycle: 1 },
        { portId: 'd1', commandId: 'c-trashed', requestBytes: 7, replyBytes: 0, perCycle: 1 },
      ],
      responseTimeoutMs: 80, targetCycleMs: 250, topology: 'daisy-chain' as const,
    };
    const members = [{ portId: 'plc', dropM: 0, tapPorts: null }, { portId: 'd1', dropM: 12.5, tapPorts: 2 }, { portId: 'd2', dropM: null, tapPorts: null }];
    const { draft, dropped } = draftOf(plan, { busPlan, members });
    expect(dropped).toBe(1);
    expect(draft.polls).toEqual([
      { portId: 'd2', commandId: '', label: 'Read', requestBytes: '8', replyBytes: '25', responseMs: '60', perCycle: '2' },
      { portId: 'd1', commandId: '', label: '', requestBytes: '7', replyBytes: '0', responseMs: '', perCycle: '1' },
    ]);
    expect(draft).toMatchObject({ timeout: '80', retries: '2', target: '250', topology: 'daisy-chain', drops: { plc: { dropM: '0', tapPorts: '' }, d1: { dropM: '12.5', tapPorts: '2' } } });
  });
});

describe('planOf', () => {
  test('round trip: a saved plan opened and saved unchanged is the same plan, and the schema takes it', () => {
    const busPlan = { polls: [{ portId: 'd1', commandId: 'c1', label: 'd1: Status', requestBytes: 6, replyBytes: 14, responseMs: 5, perCycle: 1 }, { portId: 'd2', requestBytes: 1, replyBytes: 0, perCycle: 3 }], targetCycleMs: 0 };
    const again = planOf(plan, draftOf(plan, { busPlan, members: noDrops }).draft);
    expect(again).toEqual(busPlan);
    expect(busPlanSchema.parse(again)).toEqual(busPlan);
  });

  test('timeout and retries are kept only where they differ from the master port', () => {
    const { draft } = draftOf(plan, { busPlan: null, members: noDrops });
    expect(planOf(plan, draft)).not.toHaveProperty('responseTimeoutMs');
    expect(planOf(plan, draft)).not.toHaveProperty('retries');
    expect(planOf(plan, { ...draft, timeout: '120', retries: '0' })).toMatchObject({ responseTimeoutMs: 120, retries: 0 });
  });

  test('a broadcast keeps no response time', () => {
    const { draft } = draftOf(plan, { busPlan: null, members: noDrops });
    const p = planOf(plan, { ...draft, polls: [{ ...draft.polls[1]!, replyBytes: '0', responseMs: '5' }] });
    expect(p.polls[0]).toEqual({ portId: 'd2', label: 'd2 RS-485: read 10 registers', requestBytes: 8, replyBytes: 0, perCycle: 1 });
  });
});

describe('saveBody', () => {
  const members = [
    { portId: 'plc', role: 'master', isEnd: true, unitLoads: null, dropM: null, tapPorts: null },
    { portId: 'd1', role: 'slave', isEnd: false, unitLoads: 0.5, dropM: 3, tapPorts: null },
  ];
  const base = shapeOf(null, storedDrops(members));

  test('a new plan alone sends the plan and no members', () => {
    const mine = shapeOf({ polls: [{ portId: 'd1', requestBytes: 8, replyBytes: 25, perCycle: 1 }], targetCycleMs: 100 }, base.drops);
    expect(saveBody(4, mine, [['polls'], ['targetCycleMs']], members)).toEqual({ version: 4, busPlan: { polls: mine.polls, targetCycleMs: 100 } });
  });

  test('a drop alone sends the members as the link holds them with the new drops, and no plan', () => {
    const mine = shapeOf(null, { ...base.drops, ...dropsOf({ polls: [], timeout: '', retries: '', target: '', topology: '', drops: { plc: { dropM: '2', tapPorts: '' } } }, ['plc']) });
    const body = saveBody(4, mine, [['drops', 'plc', 'dropM']], members);
    expect(body).toEqual({
      version: 4,
      members: [
        { portId: 'plc', role: 'master', isEnd: true, unitLoads: null, dropM: 2, tapPorts: null },
        { portId: 'd1', role: 'slave', isEnd: false, unitLoads: 0.5, dropM: 3, tapPorts: null },
      ],
    });
    expect(() => (body.members as unknown[]).map((m) => linkMemberSchema.parse(m))).not.toThrow();
  });

  test('a plan without polls is sent as no plan', () => {
    expect(saveBody(2, shapeOf({ polls: [] }, {}), [['polls']], [])).toEqual({ version: 2, busPlan: null });
  });
});

describe('busPlanSchema', () => {
  test('refuses unknown fields, a response time on a broadcast, and an empty poll list, with a message per field', () => {
    const poll = { portId: 'd1', requestBytes: 8, replyBytes: 25 };
    const issues = (v: unknown) => busPlanSchema.safeParse(v).error?.issues.map((i) => `${i.path.join('.')}: ${i.message}`) ?? [];
    expect(issues({ polls: [] })).toEqual(['polls: List at least one poll']);
    expect(issues({ polls: [{ ...poll, device: 'x' }] })[0]).toMatch(/^polls\.0: Unrecognized key/);
    expect(issues({ polls: [{ ...poll, replyBytes: 0, responseMs: 5 }] })).toEqual(['polls.0.responseMs: A poll without a reply (replyBytes 0) has no response time; give the reply bytes or leave responseMs out']);
    expect(issues({ polls: [{ ...poll, requestBytes: 0 }] })).toEqual(['polls.0.requestBytes: The request is at least 1 byte']);
    expect(issues({ polls: [poll], topology: 'ring' })).toEqual(['topology: Choose daisy-chain, trunk-and-drops, star']);
  });
});
