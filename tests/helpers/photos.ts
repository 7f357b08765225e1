// Test photos made on the spot: a plain JPEG from sharp, with GPS and time tags written by piexifjs.
import sharp from 'sharp';
import piexif from 'piexifjs';

export interface JpegOptions {
  width?: number;
  height?: number;
  colour?: { r: number; g: number; b: number };
  gps?: { lat: number; lon: number };
  takenAt?: string; // "YYYY:MM:DD HH:MM:SS", as EXIF writes it
}

export async function makeJpeg(opts: JpegOptions = {}): Promise<Buffer> {
  const plain = await sharp({
    create: { width: opts.width ?? 640, height: opts.height ?? 480, channels: 3, background: opts.colour ?? { r: 90, g: 140, b: 200 } },
  })
    .jpeg({ quality: 80 })
    .toBuffer();
  if (!opts.gps && !opts.takenAt) return plain;
  const exif: Record<string, Record<number, unknown>> = { '0th': { [piexif.ImageIFD.Make]: 'Bearline test camera' }, Exif: {}, GPS: {} };
  if (opts.takenAt) exif.Exif![piexif.ExifIFD.DateTimeOriginal] = opts.takenAt;
  if (opts.gps) {
    const { lat, lon } = opts.gps;
    exif.GPS![piexif.GPSIFD.GPSLatitudeRef] = lat < 0 ? 'S' : 'N';
    exif.GPS![piexif.GPSIFD.GPSLatitude] = piexif.GPSHelper.degToDmsRational(Math.abs(lat));
    exif.GPS![piexif.GPSIFD.GPSLongitudeRef] = lon < 0 ? 'W' : 'E';
    exif.GPS![piexif.GPSIFD.GPSLongitude] = piexif.GPSHelper.degToDmsRational(Math.abs(lon));
  }
  const tagged = piexif.insert(piexif.dump(exif), plain.toString('binary'));
  return Buffer.from(tagged, 'binary');
}
