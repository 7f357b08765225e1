import { describe, expect, it } from 'vitest';
import { SightingCellInputSchema, SightingInputSchema, getReadingRange } from '../../src/lib/schemas/sightings';

const base = {
  client_uuid: '3f1c9a52-8d1e-4b7a-9c35-0a6e2d4b7f10',
  lat: -47.2,
  lon: -128.5,
  position_source: 'photo',
  structure_type: 'monopole',
  observed_at: '2026-11-30T10:00:00Z',
};

function fieldsOf(result: ReturnType<typeof SightingInputSchema.safeParse>) {
  if (result.success) return {};
  return Object.fromEntries(result.error.issues.map((i) => [i.path.join('.'), i.message]));
}

describe('sighting input', () => {
  it('accepts a minimal sighting and adds the operators of its cells to the operators seen', () => {
    const v = SightingInputSchema.parse({
      ...base,
      operator_ids: ['2'],
      cells: [{ operator_id: 3, tech: 'nr', channel: 641280, pci: 900 }],
    });
    expect(v.operatorIds).toEqual(['2', '3']);
    // 3GPP TS 38.104 §5.4.2.1: NR-ARFCN 641280 is 3619.2 MHz, band n78 (also n77).
    expect(v.cells[0]!.dlMhz).toBeCloseTo(3619.2, 3);
  });

  it.each([
    [{ client_uuid: 'not-a-uuid' }, 'client_uuid'],
    [{ lat: 91 }, 'lat'],
    [{ position_source: 'guess' }, 'position_source'],
    [{ structure_type: 'guyed_mast' }, 'structure_type'],
    [{ estimated_height_m: 900 }, 'estimated_height_m'],
    [{ observed_at: '2999-01-01T00:00:00Z' }, 'observed_at'],
    [{ cells: [{ operator_id: 1, tech: 'lte', channel: 6300, pci: 504 }] }, 'cells.0.pci'],
    [{ cells: [{ operator_id: 1, tech: 'lte', channel: 6300, band: 'B3' }] }, 'cells.0.channel'],
  ])('rejects %j at %s', (patch, path) => {
    expect(fieldsOf(SightingInputSchema.safeParse({ ...base, ...patch }))).toHaveProperty([path]);
  });

  // Reporting ranges: 3GPP TS 36.133 Table 9.1.4-1 (LTE RSRP −140 … −44 dBm), Table 9.1.7-1
  // (LTE RSRQ −19.5 … −3 dB); TS 38.133 Table 10.1.6.1-1 (NR SS-RSRP −156 … −31 dBm).
  it.each([
    ['lte', 'rsrp_dbm', -140, true],
    ['lte', 'rsrp_dbm', -141, false],
    ['lte', 'rsrp_dbm', -44, true],
    ['lte', 'rsrq_db', -2.5, false],
    ['nr', 'rsrp_dbm', -150, true],
    ['nr', 'rsrp_dbm', -157, false],
  ] as const)('%s %s %d accepted: %s', (tech, field, value, ok) => {
    const channel = tech === 'lte' ? 6300 : 641280;
    const r = SightingCellInputSchema.safeParse({ operator_id: 1, tech, channel, [field]: value });
    expect(r.success).toBe(ok);
    if (!r.success) expect(r.error.issues[0]!.path).toEqual([field]);
  });

  it('refuses RSRP on a GSM cell, which reports none', () => {
    // 3GPP TS 45.005 §2: ARFCN 62 is in P-GSM 900.
    const r = SightingCellInputSchema.safeParse({ operator_id: 1, tech: 'gsm', channel: 62, rsrp_dbm: -80 });
    expect(r.success).toBe(false);
    expect(getReadingRange('gsm', 'rsrp')).toBeNull();
    expect(getReadingRange('lte', 'sinr')).toMatchObject({ min: -20, max: 30 });
  });
});
