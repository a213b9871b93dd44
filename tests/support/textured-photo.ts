/**
 * A photo-like JPEG made from a fixed seed: soft light across the frame, leaf-sized blotches
 * and fine grain, so encoders meet the detail a camera gives them (a flat colour would flatter
 * any encoder). Used by the photo tests and bench/photos.
 */
import sharp from 'sharp';

export async function texturedPhoto(
  width: number,
  height: number,
  opts: { orientation?: number; seed?: number } = {},
): Promise<Buffer> {
  let a = (opts.seed ?? 7) >>> 0;
  const rnd = () => {
    // mulberry32, a small seeded generator
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const px = Buffer.alloc(width * height * 3);
  const fx = 6 / width;
  const fy = 5 / height;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const leaf = Math.sin(x * fx * 7 + Math.sin(y * fy * 3) * 2) * Math.cos(y * fy * 9);
      const light = (x / width + y / height) * 40;
      const grain = (rnd() - 0.5) * 8;
      const i = (y * width + x) * 3;
      px[i] = clamp(70 + light + leaf * 50 + grain);
      px[i + 1] = clamp(110 + light + leaf * 70 + grain);
      px[i + 2] = clamp(45 + light * 0.5 + leaf * 25 + grain);
    }
  }
  let image = sharp(px, { raw: { width, height, channels: 3 } }).jpeg({ quality: 95 });
  if (opts.orientation) image = image.withMetadata({ orientation: opts.orientation });
  return image.toBuffer();
}

function clamp(v: number): number {
  return Math.max(0, Math.min(255, Math.round(v)));
}

/**
 * Peak signal-to-noise ratio in dB between two 8-bit images of one size (the standard
 * definition: 10·log10(255² / mean squared error) over every channel value).
 */
export async function psnr(a: Buffer, b: Buffer): Promise<number> {
  const [ra, rb] = await Promise.all(
    [a, b].map((img) =>
      sharp(img).rotate().removeAlpha().raw().toBuffer({ resolveWithObject: true }),
    ),
  );
  if (ra!.info.width !== rb!.info.width || ra!.info.height !== rb!.info.height)
    throw new Error('images differ in size');
  let sum = 0;
  for (let i = 0; i < ra!.data.length; i++) {
    const d = ra!.data[i]! - rb!.data[i]!;
    sum += d * d;
  }
  const mse = sum / ra!.data.length;
  return mse === 0 ? Infinity : 10 * Math.log10((255 * 255) / mse);
}
