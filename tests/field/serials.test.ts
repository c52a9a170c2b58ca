import { describe, expect, it } from 'vitest';
import { formerSerialsAfter } from '../../src/lib/field/serials';

describe('formerSerialsAfter', () => {
  it('keeps the old serial when the record gets a new one', () => {
    expect(formerSerialsAfter({ serialNumber: 'QS23-00410', formerSerials: [] }, 'QS23-01188')).toEqual(['QS23-00410']);
    expect(formerSerialsAfter({ serialNumber: 'B', formerSerials: ['A'] }, 'C')).toEqual(['A', 'B']);
  });

  it('changes nothing when the serial is not sent or stays the same', () => {
    expect(formerSerialsAfter({ serialNumber: 'A', formerSerials: ['Z'] }, undefined)).toBeNull();
    expect(formerSerialsAfter({ serialNumber: 'A', formerSerials: ['Z'] }, 'A')).toBeNull();
  });

  it('keeps no empty serial, and a unit going back to an earlier number leaves the list', () => {
    expect(formerSerialsAfter({ serialNumber: '', formerSerials: [] }, 'A')).toBeNull();
    expect(formerSerialsAfter({ serialNumber: 'B', formerSerials: ['A'] }, 'A')).toEqual(['B']);
    expect(formerSerialsAfter({ serialNumber: 'B', formerSerials: ['A', 'B'] }, 'C')).toBeNull();
  });
});
