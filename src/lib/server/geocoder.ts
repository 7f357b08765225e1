// Address search behind a small interface: the local gazetteer today, a hosted geocoder
// could be plugged in later without touching the endpoint or the planner page.
import type { Knex } from 'knex';
import { findNearbyAddresses, searchGazetteer } from './repos/addresses';
import { CoordinateParseError, CoordinateRangeError, formatDecimal, parseCoordinates } from '../domain/coords';
import { ValidationError } from './errors';
import type { GeocodeMatchJson } from '../schemas/addresses';

export type GeocodeMatch = GeocodeMatchJson;

export interface Geocoder {
  search(q: string, limit: number): Promise<GeocodeMatch[]>;
  /** Known addresses near a point, closest first (optional: not every geocoder offers it). */
  nearby?(lat: number, lon: number, limit: number): Promise<GeocodeMatch[]>;
}

// Typed coordinates are matched to known addresses within this distance, so a planner who
// pastes a position from a phone sees which farm it is.
const NEARBY_RADIUS_M = 1000;

export function createGazetteerGeocoder(db: Knex): Geocoder {
  return {
    async search(q, limit) {
      const hits = await searchGazetteer(db, q, limit);
      return hits.map((h) => ({ ...h, kind: 'address' as const }));
    },
    async nearby(lat, lon, limit) {
      const hits = await findNearbyAddresses(db, lat, lon, limit, NEARBY_RADIUS_M);
      // Score falls from 0.9 at the point to 0.5 at the edge of the radius.
      return hits.map(({ distanceM, ...h }) => ({
        ...h,
        score: Math.round((0.9 - 0.4 * (distanceM / NEARBY_RADIUS_M)) * 1000) / 1000,
        kind: 'address' as const,
      }));
    },
  };
}

/**
 * Geocodes what a planner typed: coordinates (decimal or degrees-minutes-seconds) come back
 * as the first match, followed by known addresses near them; coordinates out of range are a
 * validation error; anything else is an address search.
 */
export async function geocode(geocoder: Geocoder, q: string, limit: number): Promise<GeocodeMatch[]> {
  let point = null;
  try {
    point = parseCoordinates(q);
  } catch (err) {
    // A position that cannot exist is a typing slip, not an address to search for.
    if (err instanceof CoordinateRangeError) throw new ValidationError(err.message, { q: [err.message] });
    if (!(err instanceof CoordinateParseError)) throw err;
  }
  if (point) {
    const here: GeocodeMatch = { label: formatDecimal(point, 4), postcode: null, lat: point.lat, lon: point.lon, score: 1, kind: 'coordinates' };
    const near = limit > 1 && geocoder.nearby ? await geocoder.nearby(point.lat, point.lon, limit - 1) : [];
    return [here, ...near];
  }
  return geocoder.search(q, limit);
}
