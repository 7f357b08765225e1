// Smooth deterministic noise for terrain roughness and signal shadowing.

/** Lattice value noise in [−1, 1] with a quintic fade, hashed from integer corners and a seed. */
export function createValueNoise(seed: number): (x: number, y: number) => number {
  const corner = (ix: number, iy: number) => {
    let h = (Math.imul(ix, 0x27d4eb2d) ^ Math.imul(iy, 0x165667b1) ^ seed) >>> 0;
    h = Math.imul(h ^ (h >>> 15), 0x85ebca6b);
    h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
    return (((h ^ (h >>> 16)) >>> 0) / 4294967295) * 2 - 1;
  };
  const fade = (t: number) => t * t * t * (t * (t * 6 - 15) + 10);
  return (x, y) => {
    const ix = Math.floor(x);
    const iy = Math.floor(y);
    const fx = fade(x - ix);
    const fy = fade(y - iy);
    const a = corner(ix, iy) + fx * (corner(ix + 1, iy) - corner(ix, iy));
    const b = corner(ix, iy + 1) + fx * (corner(ix + 1, iy + 1) - corner(ix, iy + 1));
    return a + fy * (b - a);
  };
}
