/** Photos made in the test with sharp: a phone-like JPEG with EXIF and GPS, and a pixel bomb. */
import zlib from 'node:zlib';
import sharp from 'sharp';

export interface PhonePhotoOptions {
  width?: number;
  height?: number;
  /** EXIF orientation 1–8 (TIFF 6.0 / CIPA DC-008 tag 0x0112). */
  orientation?: number;
  dateTimeOriginal?: string;
  offsetTimeOriginal?: string;
  gps?: boolean;
  colour?: string;
}

/**
 * A JPEG as a phone writes it: camera make/model, capture time, a GPS position (an invented
 * spot) and an orientation tag. The left half is red and the right half blue, so a test can see
 * which way the pixels were turned.
 */
export async function phonePhoto(opts: PhonePhotoOptions = {}): Promise<Buffer> {
  const width = opts.width ?? 640;
  const height = opts.height ?? 480;
  const half = Math.floor(width / 2);
  const left = await sharp({
    create: { width: half, height, channels: 3, background: opts.colour ?? '#d0202a' },
  })
    .png()
    .toBuffer();
  let image = sharp({
    create: { width, height, channels: 3, background: '#1f3fbf' },
  })
    .composite([{ input: left, left: 0, top: 0 }])
    .jpeg({ quality: 90 })
    .withExif({
      IFD0: { Make: 'Testcam', Model: 'Fieldphone 1', Software: 'fixture' },
      IFD2: {
        ...(opts.dateTimeOriginal ? { DateTimeOriginal: opts.dateTimeOriginal } : {}),
        ...(opts.offsetTimeOriginal ? { OffsetTimeOriginal: opts.offsetTimeOriginal } : {}),
      },
      ...(opts.gps === false
        ? {}
        : {
            IFD3: {
              GPSLatitudeRef: 'N',
              GPSLatitude: '45/1 30/1 1234/100',
              GPSLongitudeRef: 'W',
              GPSLongitude: '93/1 15/1 4321/100',
            },
          }),
    });
  if (opts.orientation) image = image.withMetadata({ orientation: opts.orientation });
  return image.toBuffer();
}

/**
 * A tiny PNG whose header claims `width` × `height` pixels: the shape of a decompression bomb,
 * which must be refused from the header before anything is decoded. The IHDR CRC is recomputed
 * (PNG specification, ISO/IEC 15948 §5.3), so the file is well formed.
 */
export async function pngClaiming(width: number, height: number): Promise<Buffer> {
  const png = Buffer.from(
    await sharp({ create: { width: 8, height: 8, channels: 3, background: '#777' } })
      .png()
      .toBuffer(),
  );
  // signature (8) + length (4) + "IHDR" (4), then width and height as big-endian uint32
  png.writeUInt32BE(width, 16);
  png.writeUInt32BE(height, 20);
  png.writeUInt32BE(zlib.crc32(png.subarray(12, 29)) >>> 0, 29);
  return png;
}
