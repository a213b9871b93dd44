import { z } from 'zod';

/* GET /api/trials/:slug/comparison/harvest-curve */
export const harvestCurveSchema = z.object({
  unit: z.literal('g'),
  entries: z.array(
    z.object({
      entry: z.string(),
      code: z.string(),
      /** Mean over the entry's plots of the marketable mass harvested up to each date. */
      points: z.array(z.object({ date: z.string(), cumulativeMassG: z.number() })),
    }),
  ),
});
export type HarvestCurve = z.infer<typeof harvestCurveSchema>;

/* GET /api/trials/:slug/comparison/entry-site?trait=…&basis=… */
export const entrySiteSchema = z.object({
  unit: z.string(),
  cells: z.array(
    z.object({ entry: z.string(), site: z.string(), mean: z.number(), n: z.number() }),
  ),
});
export type EntrySite = z.infer<typeof entrySiteSchema>;
