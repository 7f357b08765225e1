// The measured signal layer's choices in the map's address, and a hexagon's figures from its tile attributes.
import { describe, expect, it } from 'vitest';
import { readMapUrl, writeMapUrl } from '../../src/lib/client/map-url';
import { SIGNAL_OFF, hexFiguresOf } from '../../src/components/map/signal-layers';
import { readSignalUrl, withKnownOperator, writeSignalUrl } from '../../src/components/map/signal-url';

describe('signal layer in the map address', () => {
  it('reads back what it wrote, beside the mast and view', () => {
    const state = { on: true, metric: 'sinr' as const, operatorId: '2', band: 'B20' };
    const search = writeSignalUrl('?mast=12&lat=1.00000&lon=2.00000&zoom=9.00', state);
    expect(search).toBe('?mast=12&lat=1.00000&lon=2.00000&zoom=9.00&signal=sinr&signal_operator=2&signal_band=B20');
    expect(readSignalUrl(search)).toEqual(state);
    // The mast and view parameters survive, and a later view change keeps the signal ones.
    expect(readMapUrl(search).mastId).toBe('12');
    expect(readSignalUrl(writeMapUrl(search, { mastId: null, view: { latitude: 3, longitude: 4, zoom: 5 } }))).toEqual(state);
  });

  it('leaves no trace while the layer is off, and keeps other parameters', () => {
    expect(writeSignalUrl('?region=3&signal=rsrp&signal_operator=2', SIGNAL_OFF)).toBe('?region=3');
    expect(writeSignalUrl('?signal=rsrp', SIGNAL_OFF)).toBe('');
    expect(readSignalUrl('?region=3')).toEqual(SIGNAL_OFF);
  });

  it('writes every metric with all operators and bands', () => {
    for (const metric of ['rsrp', 'rsrq', 'sinr'] as const) {
      const search = writeSignalUrl('', { on: true, metric, operatorId: '', band: '' });
      expect(search).toBe(`?signal=${metric}`);
      expect(readSignalUrl(search)).toEqual({ on: true, metric, operatorId: '', band: '' });
    }
  });

  it('ignores what is malformed: an unknown metric, a bad id, a band without an operator', () => {
    expect(readSignalUrl('?signal=rssi')).toEqual(SIGNAL_OFF);
    expect(readSignalUrl('?signal=rsrp&signal_operator=0x1')).toEqual({ on: true, metric: 'rsrp', operatorId: '', band: '' });
    expect(readSignalUrl('?signal=rsrp&signal_band=B20')).toEqual({ on: true, metric: 'rsrp', operatorId: '', band: '' });
    expect(readSignalUrl('?signal=rsrp&signal_operator=2&signal_band=%3Cb%3E')).toEqual({ on: true, metric: 'rsrp', operatorId: '2', band: '' });
    expect(readSignalUrl('?signal=rsrq&signal_operator=2&signal_band=n78')).toEqual({ on: true, metric: 'rsrq', operatorId: '2', band: 'n78' });
    // A band is never written without its operator.
    expect(writeSignalUrl('', { on: true, metric: 'rsrp', operatorId: '', band: 'B20' })).toBe('?signal=rsrp');
  });

  it('ignores a band the signal tiles would refuse, and keeps every label that cells store (common practice: one check on both sides)', () => {
    // ZZ999 looks like a band but no band table has it: the tiles would answer 400 for every tile.
    expect(readSignalUrl('?signal=rsrp&signal_operator=2&signal_band=ZZ999')).toEqual({ on: true, metric: 'rsrp', operatorId: '2', band: '' });
    expect(readSignalUrl(`?signal=rsrp&signal_operator=2&signal_band=${'B'.repeat(40)}`).band).toBe('');
    expect(readSignalUrl(`?signal=rsrp&signal_operator=${'9'.repeat(30)}`).operatorId).toBe('');
    // Labels as cells store them, not only B<n> and n<n>.
    for (const band of ['B20', 'n78', 'B3']) expect(readSignalUrl(`?signal=rsrp&signal_operator=2&signal_band=${band}`).band).toBe(band);
  });

  it('drops an operator that is not on the map, and its band, once the operators are known', () => {
    const linked = { on: true, metric: 'rsrp' as const, operatorId: '999999', band: 'B20' };
    expect(withKnownOperator(linked, null)).toBe(linked);
    expect(withKnownOperator(linked, [{ id: '1' }, { id: '2' }])).toEqual({ on: true, metric: 'rsrp', operatorId: '', band: '' });
    const known = { ...linked, operatorId: '2' };
    expect(withKnownOperator(known, [{ id: '1' }, { id: '2' }])).toBe(known);
  });
});

describe('hexagon figures', () => {
  it('reads counts and medians from the tile attributes', () => {
    const f = hexFiguresOf({ readings: 12, rsrp_count: 12, rsrp_median_dbm: -97.5, rsrq_count: 9, rsrq_median_db: -11.2, sinr_count: 0 });
    expect(f).toEqual({ readings: 12, counts: { rsrp: 12, rsrq: 9, sinr: 0 }, medians: { rsrp: -97.5, rsrq: -11.2, sinr: null } });
  });

  it('treats missing or malformed attributes as no readings', () => {
    expect(hexFiguresOf(null)).toEqual({ readings: 0, counts: { rsrp: 0, rsrq: 0, sinr: 0 }, medians: { rsrp: null, rsrq: null, sinr: null } });
    expect(hexFiguresOf({ readings: '3', rsrp_count: '3', rsrp_median_dbm: 'x' }).medians.rsrp).toBeNull();
    expect(hexFiguresOf({ readings: '3', rsrp_count: '3', rsrp_median_dbm: '-88' }).medians.rsrp).toBe(-88);
  });
});
