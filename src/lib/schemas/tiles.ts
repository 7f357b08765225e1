// Path parameters of the vector tiles.
import { z } from 'zod';

export const TILE_MAX_ZOOM = 22;

const tileNumber = (label: string) =>
  z
    .string()
    .regex(/^\d{1,8}$/, `${label} must be a whole number`)
    .transform(Number);

/**
 * z/x/y of a Web Mercator XYZ tile: z 0–22, x and y 0 … 2^z − 1 (OGC / Web Mercator tile scheme,
 * common practice of web maps).
 */
export const TileParamsSchema = z
  .object({
    layer: z.enum(['basemap', 'masts', 'signal'], { errorMap: () => ({ message: 'Layer must be basemap, masts or signal' }) }),
    z: tileNumber('z').pipe(z.number().max(TILE_MAX_ZOOM, `z must be 0–${TILE_MAX_ZOOM}`)),
    x: tileNumber('x'),
    y: tileNumber('y'),
  })
  .superRefine((t, ctx) => {
    const n = 2 ** t.z;
    if (t.x >= n) ctx.addIssue({ code: 'custom', path: ['x'], message: `x must be 0–${n - 1} at zoom ${t.z}` });
    if (t.y >= n) ctx.addIssue({ code: 'custom', path: ['y'], message: `y must be 0–${n - 1} at zoom ${t.z}` });
  });
