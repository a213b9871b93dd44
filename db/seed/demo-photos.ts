/**
 * Demo photos: simple drawings of each okra entry's pods (clearly drawings, not photographs),
 * stored through the same upload path growers use, and chosen as each entry's cover.
 */
import sharp from 'sharp';
import { setCover, uploadPhotos } from '../../server/photos/photos-service';
import type { ObjectStorage } from '../../server/storage/object-storage';
import { trialForAction } from '../../server/trials/trials-service';
import type { DB } from '../database';
import { demoLeadActor } from './demo-lead';
import { demoTrials } from './demo-season';

/** Pod colours and shapes per demo entry code (invented, to tell the drawings apart). */
const look: Record<string, { pod: string; ridge: string; length: number; width: number }> = {
  VL: { pod: '#6fae5b', ridge: '#4d8a3c', length: 0.5, width: 0.11 },
  ML: { pod: '#4f8f3a', ridge: '#35702a', length: 0.78, width: 0.1 },
  CD: { pod: '#b0703a', ridge: '#8a5328', length: 0.42, width: 0.13 },
  SR: { pod: '#7bb661', ridge: '#56913f', length: 0.55, width: 0.12 },
  RS: { pod: '#8e2a3a', ridge: '#6b1d2a', length: 0.58, width: 0.1 },
  TC: { pod: '#9cc56e', ridge: '#79a24f', length: 0.64, width: 0.09 },
};

function podDrawing(code: string, name: string): Buffer {
  const l = look[code] ?? look.VL!;
  const w = 1200;
  const h = 800;
  const pods = [0.28, 0.45, 0.62].map((y, i) => {
    const len = w * l.length * (1 - i * 0.08);
    const x0 = (w - len) / 2;
    const cy = h * y;
    const half = h * l.width * 0.5;
    return `<path d="M ${x0} ${cy} Q ${x0 + len * 0.15} ${cy - half} ${x0 + len * 0.5} ${cy - half * 0.9} T ${x0 + len} ${cy} Q ${x0 + len * 0.5} ${cy + half * 1.1} ${x0} ${cy} Z" fill="${l.pod}" stroke="${l.ridge}" stroke-width="6"/>
      <path d="M ${x0 + 20} ${cy} L ${x0 + len - 10} ${cy}" stroke="${l.ridge}" stroke-width="4" opacity="0.7"/>
      <rect x="${x0 - 40}" y="${cy - 10}" width="44" height="20" rx="6" fill="#5b7d3a"/>`;
  });
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${w}" height="${h}">
    <rect width="100%" height="100%" fill="#f3ecd8"/>
    ${pods.join('\n')}
    <rect x="60" y="${h - 110}" width="300" height="14" fill="#1f2a1c"/>
    <text x="60" y="${h - 120}" font-family="sans-serif" font-size="28" fill="#1f2a1c">10 cm (drawing)</text>
    <text x="${w - 60}" y="${h - 60}" text-anchor="end" font-family="sans-serif" font-size="40" fill="#6b4f36">${name} — demo drawing</text>
  </svg>`;
  return Buffer.from(svg);
}

export async function seedDemoPhotos(db: DB, storage: ObjectStorage): Promise<number> {
  const trial = demoTrials.find((t) => t.crop === 'Okra')!;
  const actor = await demoLeadActor(db);
  const loaded = await trialForAction(db, trial.slug, actor, 'photos.upload');
  const entries = await db
    .selectFrom('entries')
    .select(['id', 'code', 'name'])
    .where('trial_id', '=', loaded.trial.id)
    .execute();
  let stored = 0;
  for (const e of entries) {
    const jpeg = await sharp(podDrawing(e.code, e.name)).jpeg({ quality: 85 }).toBuffer();
    const {
      photos: [photo],
    } = await uploadPhotos(
      { db, storage },
      loaded,
      actor,
      trial.slug,
      [{ buffer: jpeg, originalname: `${e.code}.jpg` }],
      {
        caption: `${e.name}: three pods at picking size (drawing for the demo)`,
        entryId: e.id,
        subject: 'fruit',
        takenOn: '2026-08-12',
      },
    );
    await setCover({ db, storage }, trial.slug, actor, photo!.id, true);
    stored += 1;
  }
  return stored;
}
