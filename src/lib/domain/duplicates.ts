// Which existing masts a sighting may be a second report of, and how its cells line up with a
// mast's cells. Pure: the database finds the masts within the radius and their distances.

/** Masts within this distance of a sighting are offered as possible duplicates (common practice). */
export const DUPLICATE_RADIUS_M = 300;

/** The fields that identify one carrier on one sector. */
export interface CellIdentity {
  operatorId: string;
  tech: string;
  channel: number;
  pci: number | null;
}

/**
 * A shared cell: same operator, channel and PCI. PCIs repeat across a network, but not on the same
 * channel within a few hundred metres, so a match this close is the same cell (common practice).
 * A cell without a PCI cannot be matched this way.
 */
export function isSharedCell(a: CellIdentity, b: CellIdentity): boolean {
  return a.pci !== null && b.pci !== null && a.operatorId === b.operatorId && a.channel === b.channel && a.pci === b.pci;
}

/** The same carrier for a merge: like a shared cell, and also when neither has a PCI on that operator, technology and channel. */
export function isSameCell(a: CellIdentity, b: CellIdentity): boolean {
  if (a.operatorId !== b.operatorId || a.tech !== b.tech || a.channel !== b.channel) return false;
  return a.pci === b.pci;
}

export interface NearbyMast<C extends CellIdentity = CellIdentity> {
  mastId: string;
  distanceM: number;
  cells: C[];
}

export interface DuplicateCandidate<C extends CellIdentity = CellIdentity> extends NearbyMast<C> {
  sharedCells: number;
}

/**
 * Ranks the masts near a sighting: most shared cells first (the strongest evidence of the same
 * mast), then the nearest; ties by mast id so the order is stable. Masts beyond the radius are
 * dropped.
 */
export function rankDuplicates<C extends CellIdentity>(
  sightingCells: CellIdentity[],
  nearby: NearbyMast<C>[],
  radiusM = DUPLICATE_RADIUS_M,
): DuplicateCandidate<C>[] {
  return nearby
    .filter((m) => m.distanceM <= radiusM)
    .map((m) => ({ ...m, sharedCells: sightingCells.filter((s) => m.cells.some((c) => isSharedCell(s, c))).length }))
    .sort((a, b) => b.sharedCells - a.sharedCells || a.distanceM - b.distanceM || Number(a.mastId) - Number(b.mastId));
}

export interface CellPair<S, M> {
  sighting: S | null;
  mast: M | null;
  shared: boolean;
}

/**
 * The sighting's cells beside the mast's cells for the reviewer: each sighting cell with the mast
 * cell it matches (or none), then the mast's cells the surveyor did not report.
 */
export function pairCells<S extends CellIdentity, M extends CellIdentity>(sightingCells: S[], mastCells: M[]): CellPair<S, M>[] {
  const taken = new Set<number>();
  const pairs: CellPair<S, M>[] = sightingCells.map((s) => {
    const i = mastCells.findIndex((m, k) => !taken.has(k) && isSameCell(s, m));
    if (i < 0) return { sighting: s, mast: null, shared: false };
    taken.add(i);
    return { sighting: s, mast: mastCells[i]!, shared: isSharedCell(s, mastCells[i]!) };
  });
  mastCells.forEach((m, k) => {
    if (!taken.has(k)) pairs.push({ sighting: null, mast: m, shared: false });
  });
  return pairs;
}

/** For a merge: which sighting cells the mast already has (to mark observed) and which are new. */
export function splitForMerge<S extends CellIdentity, M extends CellIdentity & { id: string }>(
  sightingCells: S[],
  mastCells: M[],
): { existing: Array<{ sighting: S; mastCellId: string }>; added: S[] } {
  const existing: Array<{ sighting: S; mastCellId: string }> = [];
  const added: S[] = [];
  for (const s of sightingCells) {
    const match = mastCells.find((m) => isSameCell(s, m));
    if (match) existing.push({ sighting: s, mastCellId: match.id });
    // Two identical cells in one report add one cell to the mast.
    else if (!added.some((a) => isSameCell(a, s))) added.push(s);
  }
  return { existing, added };
}
