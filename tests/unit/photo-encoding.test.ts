/**
 * The stored sizes of an upload: upright, the right edges, and a full-size copy whose fidelity
 * the faster encoder does not trade away. Fidelity is PSNR (10·log10(255²/MSE), the standard
 * definition) against the upload's own upright pixels.
 */
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { PHOTO_DISPLAY_EDGE, PHOTO_THUMB_EDGE } from '../../common/contracts/photos';
import { processPhoto } from '../../server/photos/photo-processing';
import { psnr, texturedPhoto } from '../support/textured-photo';

describe('processPhoto', () => {
  it('keeps the full-size copy within a quarter decibel of the slower trellis encoder, upright', async () => {
    // Orientation 6: the camera was turned a quarter; the stored copy is upright (TIFF 6.0 tag 0x0112).
    const upload = await texturedPhoto(1200, 900, { orientation: 6 });
    const photo = await processPhoto(upload);
    expect(photo.original).toMatchObject({ width: 900, height: 1200, contentType: 'image/jpeg' });

    const trellis = await sharp(upload).rotate().jpeg({ quality: 92, mozjpeg: true }).toBuffer();
    const stored = await psnr(upload, photo.original.buffer);
    // A quarter decibel: our own margin, far below a visible difference (common practice, no source).
    expect(stored).toBeGreaterThanOrEqual((await psnr(upload, trellis)) - 0.25);
    // 40 dB: commonly taken as no visible loss for 8-bit photos (common practice, no source).
    expect(stored).toBeGreaterThan(40);
  }, 30_000);

  it('makes the display and thumbnail sizes from the same upright pixels', async () => {
    const upload = await texturedPhoto(2000, 1500, { orientation: 8 });
    const photo = await processPhoto(upload);
    expect(photo.display).toMatchObject({
      width: PHOTO_DISPLAY_EDGE * 0.75,
      height: PHOTO_DISPLAY_EDGE,
    });
    expect(photo.thumb.height).toBe(PHOTO_THUMB_EDGE);
    const meta = await sharp(photo.display.buffer).metadata();
    expect(meta.format).toBe('webp');
    expect(meta.exif).toBeUndefined();
    // The thumbnail looks like the upload shrunk: compare against a plain resize of it.
    const expected = await sharp(upload)
      .rotate()
      .resize(PHOTO_THUMB_EDGE, PHOTO_THUMB_EDGE, { fit: 'inside' })
      .png()
      .toBuffer();
    // 30 dB against a plain resize: resampling filters differ, so the bar is below the full-size
    // copy's (common practice, no source).
    expect(await psnr(expected, await sharp(photo.thumb.buffer).png().toBuffer())).toBeGreaterThan(
      30,
    );
  }, 30_000);
});
