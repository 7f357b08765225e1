import { describe, expect, it } from 'vitest';
import { isSameCell, isSharedCell, pairCells, rankDuplicates, splitForMerge, DUPLICATE_RADIUS_M } from '../../src/lib/domain/duplicates';

const cell = (operatorId: string, channel: number, pci: number | null, tech = 'lte', id = `${operatorId}-${channel}-${pci}`) => ({
  id,
  operatorId,
  tech,
  channel,
  pci,
});

describe('shared cells (same operator + channel + PCI; common practice)', () => {
  it.each([
    [cell('1', 6300, 101), cell('1', 6300, 101), true],
    [cell('1', 6300, 101), cell('2', 6300, 101), false],
    [cell('1', 6300, 101), cell('1', 1300, 101), false],
    [cell('1', 6300, 101), cell('1', 6300, 102), false],
    [cell('1', 6300, null), cell('1', 6300, null), false],
  ])('%j and %j: %s', (a, b, shared) => {
    expect(isSharedCell(a, b)).toBe(shared);
  });

  it('treats two cells without PCI on the same operator, technology and channel as the same carrier for a merge', () => {
    expect(isSameCell(cell('1', 6300, null), cell('1', 6300, null))).toBe(true);
    expect(isSameCell(cell('1', 6300, null), cell('1', 6300, 5))).toBe(false);
    expect(isSameCell(cell('1', 6300, 5, 'lte'), cell('1', 6300, 5, 'nr'))).toBe(false);
  });
});

describe('rankDuplicates', () => {
  const seen = [cell('1', 6300, 101), cell('1', 1300, 101), cell('2', 3350, 7), cell('3', 100, null)];

  it('puts the mast sharing most cells first, then the nearest', () => {
    const ranked = rankDuplicates(seen, [
      { mastId: '10', distanceM: 12, cells: [cell('2', 3350, 8)] },
      { mastId: '11', distanceM: 240, cells: [cell('1', 6300, 101), cell('1', 1300, 101)] },
      { mastId: '12', distanceM: 95, cells: [cell('2', 3350, 7)] },
      { mastId: '13', distanceM: 40, cells: [] },
    ]);
    expect(ranked.map((m) => [m.mastId, m.sharedCells])).toEqual([
      ['11', 2],
      ['12', 1],
      ['10', 0],
      ['13', 0],
    ]);
  });

  it('drops masts beyond the radius and keeps a stable order for ties', () => {
    const ranked = rankDuplicates(seen, [
      { mastId: '21', distanceM: 50, cells: [] },
      { mastId: '20', distanceM: 50, cells: [] },
      { mastId: '22', distanceM: DUPLICATE_RADIUS_M + 0.5, cells: [cell('1', 6300, 101)] },
      { mastId: '23', distanceM: DUPLICATE_RADIUS_M, cells: [] },
    ]);
    expect(ranked.map((m) => m.mastId)).toEqual(['20', '21', '23']);
  });

  it('does not count a cell without PCI as shared', () => {
    expect(rankDuplicates([cell('3', 100, null)], [{ mastId: '1', distanceM: 5, cells: [cell('3', 100, null)] }])[0]!.sharedCells).toBe(0);
  });

  it('counts each sighting cell once even when the mast lists it twice', () => {
    expect(
      rankDuplicates([cell('1', 6300, 101)], [{ mastId: '1', distanceM: 5, cells: [cell('1', 6300, 101, 'lte', 'a'), cell('1', 6300, 101, 'lte', 'b')] }])[0]!
        .sharedCells,
    ).toBe(1);
  });
});

describe('pairCells and splitForMerge', () => {
  const sighting = [cell('1', 6300, 101), cell('2', 3350, 7), cell('3', 100, null)];
  const mast = [cell('9', 500, 1, 'lte', 'm1'), cell('1', 6300, 101, 'lte', 'm2'), cell('3', 100, null, 'lte', 'm3')];

  it('lines up matching cells and lists the rest of both sides', () => {
    const pairs = pairCells(sighting, mast);
    expect(pairs.map((p) => [p.sighting?.id ?? null, p.mast?.id ?? null, p.shared])).toEqual([
      ['1-6300-101', 'm2', true],
      ['2-3350-7', null, false],
      ['3-100-null', 'm3', false],
      [null, 'm1', false],
    ]);
  });

  it('adds only the cells the mast does not have, once each', () => {
    const { existing, added } = splitForMerge([...sighting, cell('2', 3350, 7), cell('1', 6300, 101)], mast);
    expect(existing.map((e) => e.mastCellId)).toEqual(['m2', 'm3', 'm2']);
    expect(added.map((c) => c.id)).toEqual(['2-3350-7']);
  });
});
