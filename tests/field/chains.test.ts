/** Chains through converters, in words: what the machine page draws and the field card prints. */
import { describe, expect, test } from 'vitest';
import { converterChains, portRoutes, type ChainLink } from '~/lib/field/chains';

const bridge = (other: { portId: string; portName: string }, beyond: { deviceTag: string; portName: string }[]) => ({ deviceTag: 'CV-1', other, beyond });
/** PLC-1 X2 ── "A" ── CV-1 RS-232 ⇄ CV-1 RS-485 ── "B" (bus) ── DRV-1 RS-485, DRV-2 RS-485. */
const links: ChainLink[] = [
  { id: 'b', name: 'B', report: { state: 'error' }, members: [
    { portId: 'cv485', deviceTag: 'CV-1', portName: 'RS-485', role: 'master', bridge: bridge({ portId: 'cv232', portName: 'RS-232' }, [{ deviceTag: 'PLC-1', portName: 'X2' }]) },
    { portId: 'd1', deviceTag: 'DRV-1', portName: 'RS-485', role: 'slave' },
    { portId: 'd2', deviceTag: 'DRV-2', portName: 'RS-485', role: 'slave' },
  ] },
  { id: 'a', name: 'A', report: { state: 'ok' }, members: [
    { portId: 'plc', deviceTag: 'PLC-1', portName: 'X2', role: 'master' },
    { portId: 'cv232', deviceTag: 'CV-1', portName: 'RS-232', role: 'slave', bridge: bridge({ portId: 'cv485', portName: 'RS-485' }, [{ deviceTag: 'DRV-1', portName: 'RS-485' }, { deviceTag: 'DRV-2', portName: 'RS-485' }]) },
  ] },
];

describe('converter chains', () => {
  test('one chain per bridged pair, the side the requests come from first', () => {
    expect(converterChains(links)).toEqual([{
      converter: 'CV-1',
      sides: [
        { portName: 'RS-232', link: { id: 'a', name: 'A', state: 'ok' }, ends: ['PLC-1 X2'] },
        { portName: 'RS-485', link: { id: 'b', name: 'B', state: 'error' }, ends: ['DRV-1 RS-485', 'DRV-2 RS-485'] },
      ],
    }]);
  });
  test('a side whose link is not in the list shows the ports the bridge reaches, without a link', () => {
    expect(converterChains([links[1]!])[0]!.sides[1]).toEqual({ portName: 'RS-485', link: null, ends: ['DRV-1 RS-485', 'DRV-2 RS-485'] });
  });
  test('no converter, no chain', () => {
    expect(converterChains([{ id: 'x', name: 'X', report: { state: 'ok' }, members: [{ portId: 'p', deviceTag: 'P', portName: 'X' }] }])).toEqual([]);
  });
});

describe('where a port is wired', () => {
  test('the PLC port: through the converter to the drives', () => {
    expect(portRoutes('plc', links)).toEqual(['Wired to CV-1 RS-232, through CV-1 to DRV-1 RS-485, DRV-2 RS-485 (A)']);
  });
  test('a drive: the other drive, and through the converter to the PLC', () => {
    expect(portRoutes('d1', links)).toEqual(['Wired to CV-1 RS-485, through CV-1 to PLC-1 X2, DRV-2 RS-485 (B)']);
  });
  test("the converter's own port says what it is carried across to", () => {
    expect(portRoutes('cv232', links)).toEqual(['Wired to PLC-1 X2 (A); carried across CV-1 to its RS-485, wired to DRV-1 RS-485, DRV-2 RS-485']);
  });
  test('a port on no link has no route', () => {
    expect(portRoutes('nowhere', links)).toEqual([]);
  });
});
