// Synthetic ground written as a GeoTIFF the way the elevation import reads it: the demo seed's
// island, the benchmark's hills and the tests' small fixtures.
import { writeArrayBuffer } from 'geotiff';

export interface GridSpec {
  /** Longitude and latitude of the north-west sample, degrees. */
  west: number;
  north: number;
  /** Sample spacing, degrees (the same east–west and north–south). */
  step: number;
  width: number;
  height: number;
  /** The value that marks a void (GDAL_NODATA), when the grid may hold one. */
  noData?: number;
}

/**
 * A single-band float32 GeoTIFF in EPSG:4326 whose sample at row `row`, column `col` (row 0 in the
 * north) is `heightAt(lat, lon, col, row)` metres, lat = north − row·step, lon = west + col·step.
 * Geo keys: GeoTIFF 1.1 (OGC 19-008r4) ModelTiepoint + ModelPixelScale, geographic model (2),
 * point-registered rasters (2).
 */
export function heightTiff(grid: GridSpec, heightAt: (lat: number, lon: number, col: number, row: number) => number): Uint8Array {
  const { west, north, step, width, height, noData } = grid;
  const values = new Float32Array(width * height);
  for (let r = 0; r < height; r++) {
    const lat = north - r * step;
    for (let c = 0; c < width; c++) values[r * width + c] = heightAt(lat, west + c * step, c, r);
  }
  return new Uint8Array(
    writeArrayBuffer(values, {
      width,
      height,
      ModelPixelScale: [step, step, 0],
      ModelTiepoint: [0, 0, 0, west, north, 0],
      GTModelTypeGeoKey: 2,
      GTRasterTypeGeoKey: 2,
      GeographicTypeGeoKey: 4326,
      ...(noData === undefined ? {} : { GDAL_NODATA: String(noData) }),
    }),
  );
}
