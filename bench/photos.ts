/**
 * Benchmark: one 12-megapixel phone JPEG (4000 × 3000, turned by its EXIF tag) made into the
 * three stored sizes by the app, against a bare sharp pipeline making the same sizes with the
 * same encoders. Both run alternately in one process so machine load hits them alike.
 *   npm run bench:photos
 */
import sharp from 'sharp';
import { PHOTO_DISPLAY_EDGE, PHOTO_THUMB_EDGE } from '../common/contracts/photos.js';
import { FULL_SIZE_JPEG, processPhoto } from '../server/photos/photo-processing.js';
import { texturedPhoto } from '../tests/support/textured-photo.js';

const TARGET = 1.2;
const ROUNDS = 5;

async function bare(input: Buffer): Promise<number> {
  const fit = { fit: 'inside', withoutEnlargement: true } as const;
  const out = await Promise.all([
    sharp(input).rotate().jpeg(FULL_SIZE_JPEG).toBuffer(),
    sharp(input)
      .rotate()
      .resize(PHOTO_DISPLAY_EDGE, PHOTO_DISPLAY_EDGE, fit)
      .webp({ quality: 82 })
      .toBuffer(),
    sharp(input)
      .rotate()
      .resize(PHOTO_THUMB_EDGE, PHOTO_THUMB_EDGE, fit)
      .webp({ quality: 75 })
      .toBuffer(),
  ]);
  return out.reduce((n, b) => n + b.length, 0);
}

async function app(input: Buffer): Promise<number> {
  const p = await processPhoto(input);
  return p.original.buffer.length + p.display.buffer.length + p.thumb.buffer.length;
}

async function timed(fn: () => Promise<number>): Promise<number> {
  const t0 = performance.now();
  await fn();
  return performance.now() - t0;
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

const input = await texturedPhoto(4000, 3000, { orientation: 6 });
console.log(`input: 4000 × 3000 JPEG, ${(input.length / 1e6).toFixed(1)} MB`);
await app(input);
await bare(input);
const appTimes: number[] = [];
const bareTimes: number[] = [];
for (let i = 0; i < ROUNDS; i++) {
  appTimes.push(await timed(() => app(input)));
  bareTimes.push(await timed(() => bare(input)));
}
const ratio = median(appTimes) / median(bareTimes);
console.log(`app  median ${median(appTimes).toFixed(0)} ms over ${ROUNDS} rounds`);
console.log(`bare median ${median(bareTimes).toFixed(0)} ms`);
console.log(
  `photos: ratio ${ratio.toFixed(2)} (target ${TARGET}) ${ratio <= TARGET ? 'met' : 'NOT met'}`,
);
