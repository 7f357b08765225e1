import { describe, expect, it } from 'vitest';
import { sniffImageType } from '../../src/lib/domain/image-type';

const bytes = (...b: number[]) => new Uint8Array(b);
const ascii = (s: string) => new Uint8Array(Buffer.from(s, 'binary'));

describe('image type from the bytes', () => {
  it.each([
    // ITU-T T.81 (JPEG) SOI marker FF D8 followed by a marker.
    ['JPEG (JFIF)', bytes(0xff, 0xd8, 0xff, 0xe0, 0, 0x10, 0x4a, 0x46, 0x49, 0x46, 0, 1), 'image/jpeg'],
    ['JPEG (EXIF)', bytes(0xff, 0xd8, 0xff, 0xe1, 0x12, 0x34, 0x45, 0x78, 0x69, 0x66, 0, 0), 'image/jpeg'],
    // ISO/IEC 15948 §5.2 PNG signature.
    ['PNG', bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d), 'image/png'],
    // RFC 9649 §2.5: RIFF, a 4-byte size, WEBP.
    ['WebP', ascii('RIFF\x24\x00\x00\x00WEBPVP8 '), 'image/webp'],
    ['HTML named .jpg', ascii('<!DOCTYPE html><html>'), null],
    ['a RIFF that is WAVE audio', ascii('RIFF\x24\x00\x00\x00WAVEfmt '), null],
    ['GIF', ascii('GIF89a\x01\x00\x01\x00'), null],
    ['PNG signature cut short', bytes(0x89, 0x50, 0x4e, 0x47), null],
    ['nothing', bytes(), null],
  ])('%s → %s', (_name, input, expected) => {
    expect(sniffImageType(input)).toBe(expected);
  });
});
