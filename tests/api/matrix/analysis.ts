/**
 * Analysis, ranking, weather and season routes. Reads run on a small balanced trial of this
 * file's own (same members as the matrix world) so a member's read really computes (200);
 * weather writes go to the world's site A, so a grower limited to site B is refused.
 */
import { memberRead, recordWrite, type MatrixRow } from './matrix-types';
import type { MatrixWorld } from './matrix-world';
import { insertBlocksTrial, vigorScoreTrait } from '../../support/trial-fixture';

const analysisTrials = new WeakMap<MatrixWorld, Promise<string>>();

/** rcbd, 3 entries × 2 blocks, a vigor score per plot (fictional values). */
function analysisTrial(w: MatrixWorld): Promise<string> {
  let p = analysisTrials.get(w);
  if (!p) {
    p = (async () => {
      const db = w.t.db;
      const t = await insertBlocksTrial(db, {
        trial: { slug: 'matrix-analysis', title: 'Matrix analysis trial', crop: 'Okra' },
        siteName: 'Only site',
        entryNames: ['Ash Pod', 'Birch Pod', 'Cedar Pod'],
        blocks: 2,
        trait: vigorScoreTrait,
      });
      const scores = [
        [3, 4],
        [4, 5],
        [2, 2],
      ];
      // Entry e's score in block b sits on plot b × 100 + e + 1.
      await db
        .insertInto('observations')
        .values(
          scores.flatMap((byBlock, e) =>
            byBlock.map((value, b) => ({
              trial_id: t.trialId,
              plot_id: t.plotIds[(b + 1) * 100 + e + 1]!,
              trait_id: t.traitId,
              observed_on: '2026-07-01',
              value,
            })),
          ),
        )
        .execute();
      const roles = {
        viewer: 'viewer',
        contributor: 'contributor',
        growerInSite: 'grower',
        growerOtherSite: 'grower',
        lead: 'lead',
      } as const;
      for (const [caller, role] of Object.entries(roles) as [keyof typeof roles, string][]) {
        await db
          .insertInto('trial_members')
          .values({ trial_id: t.trialId, user_id: w.users[caller].id, role: role as 'lead' })
          .execute();
      }
      return 'matrix-analysis';
    })();
    analysisTrials.set(w, p);
  }
  return p;
}

async function weatherDay(w: MatrixWorld, date: string) {
  await w.t.db
    .insertInto('daily_weather')
    .values({ trial_id: w.trial.id, site_id: w.siteA, observed_on: date, tmin_c: 14, tmax_c: 27 })
    .onConflict((oc) => oc.columns(['site_id', 'observed_on']).doNothing())
    .execute();
}

const signedIn = {
  anonymous: 401,
  viewer: 200,
  contributor: 200,
  growerInSite: 200,
  growerOtherSite: 200,
  lead: 200,
  admin: 200,
};

export const rows: MatrixRow[] = [
  {
    method: 'GET',
    route: '/api/trials/:slug/analysis',
    request: async (w) => ({ url: `/api/trials/${await analysisTrial(w)}/analysis?trait=vigor` }),
    expect: memberRead,
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/ranking',
    request: async (w) => ({ url: `/api/trials/${await analysisTrial(w)}/ranking?traits=vigor` }),
    expect: memberRead,
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/weather',
    request: (w) => ({ url: `/api/trials/${w.trial.slug}/weather?siteId=${w.siteA}` }),
    expect: memberRead,
  },
  {
    method: 'PUT',
    route: '/api/trials/:slug/weather/:siteId/:date',
    request: (w) => ({
      url: `/api/trials/${w.trial.slug}/weather/${w.siteA}/2026-06-02`,
      body: { tminC: 12.5, tmaxC: 26, rainMm: 3 },
    }),
    expect: recordWrite(200),
  },
  {
    method: 'DELETE',
    route: '/api/trials/:slug/weather/:siteId/:date',
    request: async (w) => {
      await weatherDay(w, '2026-06-03');
      return { url: `/api/trials/${w.trial.slug}/weather/${w.siteA}/2026-06-03` };
    },
    expect: recordWrite(204),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/weather/import',
    request: (w) => ({
      url: `/api/trials/${w.trial.slug}/weather/import`,
      body: {
        siteId: w.siteA,
        csv: 'date,tmin,tmax,rain\n2026-06-04,13,25,0\n2026-06-05,15,29,4.2\n',
        dryRun: false,
      },
    }),
    expect: recordWrite(201),
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/season',
    request: (w) => ({ url: `/api/trials/${w.trial.slug}/season` }),
    expect: memberRead,
  },
  {
    method: 'POST',
    route: '/api/analyze',
    request: () => ({
      url: '/api/analyze',
      body: { csv: 'block,variety,value\n1,A,3\n1,B,5\n2,A,4\n2,B,6\n3,A,2\n3,B,5\n' },
    }),
    expect: signedIn,
  },
];
