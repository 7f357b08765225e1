import { describe, expect, it } from 'vitest';
import exifr from 'exifr';
import sharp from 'sharp';
import { processPhoto, readPhotoGps } from '../../src/lib/server/photos';
import { makeJpeg } from '../helpers/photos';

describe('sighting photos', () => {
  it('reads the GPS position and time a JPEG carries in its EXIF tags', async () => {
    const jpeg = await makeJpeg({ gps: { lat: -47.21834, lon: -128.49012 }, takenAt: '2026:11:30 10:15:00' });
    const gps = await readPhotoGps(jpeg);
    // EXIF GPS is degrees/minutes/seconds as rationals (CIPA DC-008 §4.6.6): good to ~1e-6°.
    expect(gps!.lat).toBeCloseTo(-47.21834, 5);
    expect(gps!.lon).toBeCloseTo(-128.49012, 5);
    const p = await processPhoto(jpeg);
    expect(p.takenAt).toBeInstanceOf(Date);
    expect(p.gps!.lat).toBeCloseTo(-47.21834, 5);
  });

  it('gives no position for a photo without GPS tags', async () => {
    expect(await readPhotoGps(await makeJpeg())).toBeNull();
  });

  it('makes a display copy and a thumbnail without GPS or any other EXIF, no larger than their limits', async () => {
    const jpeg = await makeJpeg({ width: 2400, height: 1200, gps: { lat: 10, lon: 20 }, takenAt: '2026:11:30 10:15:00' });
    const p = await processPhoto(jpeg);
    expect(p.mime).toBe('image/jpeg');
    expect([p.width, p.height]).toEqual([2400, 1200]);
    expect(p.sha256).toMatch(/^[0-9a-f]{64}$/);
    for (const [copy, maxPx] of [
      [p.display, 1600],
      [p.thumb, 320],
    ] as const) {
      expect(await exifr.gps(Buffer.from(copy)).catch(() => undefined)).toBeUndefined();
      expect(await exifr.parse(Buffer.from(copy)).catch(() => undefined)).toBeUndefined();
      const meta = await sharp(copy).metadata();
      expect(meta.exif).toBeUndefined();
      expect(Math.max(meta.width!, meta.height!)).toBe(maxPx);
    }
  });

  it.each([
    ['an HTML page', Buffer.from('<!doctype html><html><body>not a photo</body></html>'), 'UNSUPPORTED_MEDIA_TYPE'],
    ['a GIF', Buffer.from('GIF89a\x01\x00\x01\x00\x00\x00\x00;', 'binary'), 'UNSUPPORTED_MEDIA_TYPE'],
    ['a truncated JPEG', Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46]), 'UNPROCESSABLE_CONTENT'],
  ])('refuses %s', async (_name, bytes, code) => {
    await expect(processPhoto(new Uint8Array(bytes))).rejects.toMatchObject({ code });
  });
});
