// Image type from the first bytes of a file (its signature), never from its name or the type a
// browser claims: a page saved as "mast.jpg" is still HTML.

export type ImageMime = 'image/jpeg' | 'image/png' | 'image/webp';

/** Bytes needed to tell the types apart. */
export const IMAGE_SNIFF_BYTES = 12;

const startsWith = (bytes: Uint8Array, sig: readonly number[], at = 0) => sig.every((b, i) => bytes[at + i] === b);

/**
 * JPEG starts FF D8 FF (ITU-T T.81 SOI marker + next marker), PNG with its 8-byte signature
 * (ISO/IEC 15948 §5.2), WebP with "RIFF" <size> "WEBP" (RFC 9649 §2.5). Anything else is null.
 */
export function sniffImageType(bytes: Uint8Array): ImageMime | null {
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return 'image/jpeg';
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'image/png';
  if (startsWith(bytes, [0x52, 0x49, 0x46, 0x46]) && startsWith(bytes, [0x57, 0x45, 0x42, 0x50], 8)) return 'image/webp';
  return null;
}

export const IMAGE_EXTENSIONS: Record<ImageMime, string> = { 'image/jpeg': 'jpg', 'image/png': 'png', 'image/webp': 'webp' };
