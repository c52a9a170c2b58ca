import { describe, expect, test } from 'vitest';
import { checkBusLayout, maxDropM } from '~/lib/frame/bus-layout';

const m = (id: string, more: object = {}) => ({ id, label: id, ...more });

describe('checkBusLayout', () => {
  test('drops: 20 m each, 40 m ÷ n on an n-port tap', () => {
    // Modbus over Serial Line V1.02 §3.4.2: derivations never more than 20 m; 40 m / n on an n-port tap
    expect(maxDropM()).toBe(20);
    expect(maxDropM(4)).toBe(10);
    expect(checkBusLayout([m('a', { dropM: 20 }), m('b', { dropM: 10, tapPorts: 4 })], { trunkM: 100 })).toEqual([]);
    const f = checkBusLayout([m('a', { dropM: 20.5 }), m('b', { dropM: 10.5, tapPorts: 4 }), m('c', { dropM: 14, tapPorts: 3 })], { trunkM: 100 });
    expect(f.map((x) => [x.code, x.memberId])).toEqual([['drop-too-long', 'a'], ['drop-too-long', 'b'], ['drop-too-long', 'c']]);
    expect(f[1]!.message).toContain('10 m on a 4-port tap');
    expect(f[2]!.message).toContain('13.33 m on a 3-port tap');
  });

  test('bias at more than one point, termination at more than two', () => {
    // Modbus over Serial Line V1.02 §3.4.6: polarization at one location only; §3.4.5: a terminator at each end
    expect(checkBusLayout([m('a', { bias: true, termination: true }), m('b'), m('c', { termination: true })])).toEqual([]);
    const f = checkBusLayout([m('a', { bias: true, termination: true }), m('b', { bias: true, termination: true }), m('c', { termination: true })]);
    expect(f.map((x) => x.code)).toEqual(['bias-multiple', 'termination-too-many']);
    expect(f[0]!.message).toContain('2 devices bias the bus (a, b)');
  });

  test('a star: said so, or three drops with no trunk longer than the longest', () => {
    // Modbus over Serial Line V1.02 §3.4.2: one trunk cable, devices on it directly or on short derivations
    const drops = [m('a', { dropM: 5 }), m('b', { dropM: 8 }), m('c', { dropM: 6 })];
    expect(checkBusLayout(drops, { trunkM: 8 }).map((x) => x.code)).toEqual(['star-layout']);
    expect(checkBusLayout(drops, {}).map((x) => x.code)).toEqual(['star-layout']);
    expect(checkBusLayout(drops, { trunkM: 40 })).toEqual([]);
    expect(checkBusLayout(drops.slice(0, 2), {})).toEqual([]);
    expect(checkBusLayout([m('a'), m('b')], { topology: 'star' }).map((x) => x.code)).toEqual(['star-layout']);
    expect(checkBusLayout(drops, { trunkM: 0, topology: 'trunk-and-drops' })).toEqual([]);
    expect(checkBusLayout([])).toEqual([]);
  });
});
