/**
 * A trial's figures as one caller may see them: live from the records for the trial's
 * members, from the latest published version for everyone else once published, nothing
 * otherwise. The variety page and the cross-season table both read trials through here.
 */
import type { TrialAnalysis } from '../../common/contracts/analysis';
import { sheetTraitDecimals, type ResultSnapshot } from '../../common/contracts/results';
import { type Actor, can } from '../../common/policy';
import type { DB } from '../../db/database';
import type { Trial } from '../../db/schema';
import { analyseTrialTrait } from '../analysis/analysis-service';
import { AppError } from '../lib/app-error';
import { publicVersion } from '../results/results-service';
import { loadTrialAccess } from '../trials/trial-access';
import * as repo from './varieties-repository';

export interface TraitFigures {
  key: string;
  label: string;
  unit: string;
  direction: 'higher' | 'lower' | 'none';
  decimals: number;
  /** Keyed by the entry's name as the analysis (or the published version) knows it. */
  means: Map<string, { mean: number; rank: number | null; group: string }>;
  plotValues: { entry: string; site: string; value: number }[];
}

/** What a caller may see of a trial, read once; its traits are analysed on demand. */
export interface TrialReading {
  view: 'trial' | 'sheet';
  version: number | null;
  /** Entry id → the name its means are kept under. */
  entryNames: Map<string, string>;
  /** Every trait of the trial (the analysed ones are in `figures`). */
  traits: { key: string; label: string }[];
  snapshot: ResultSnapshot | null;
  /** The figures of the traits chosen, from what was read (live: one analysis per trait). */
  analyse(which: Analyse): Promise<{ figures: TraitFigures[]; warnings: string[] }>;
}

export interface TrialFigures extends TrialReading {
  figures: TraitFigures[];
  warnings: string[];
}

function fromAnalysis(a: TrialAnalysis): TraitFigures {
  const adjusted = new Map(a.adjustedMeans.map((m) => [m.variety, m.mean]));
  return {
    key: a.traitKey,
    label: a.traitLabel,
    unit: a.unit,
    direction: a.direction,
    decimals: a.decimals.mean,
    // Ranks and letters follow the least-squares means on unbalanced layouts; so does the mean shown.
    means: new Map(
      a.means.map((m) => [
        m.variety,
        { mean: adjusted.get(m.variety) ?? m.mean, rank: m.rank, group: m.group },
      ]),
    ),
    plotValues: a.plotValues.map((p) => ({ entry: p.entry, site: p.site, value: p.value })),
  };
}

function fromSnapshot(s: ResultSnapshot, trait: ResultSnapshot['traits'][number]): TraitFigures {
  const onlySite = s.sites.length === 1 ? s.sites[0]!.name : '';
  return {
    key: trait.key,
    label: trait.label,
    unit: trait.unit,
    direction: trait.direction,
    decimals: sheetTraitDecimals(s, trait).mean,
    means: new Map(
      trait.means.map((m) => [
        m.variety,
        { mean: m.adjustedMean ?? m.mean, rank: m.rank, group: m.group },
      ]),
    ),
    plotValues: s.plotValues
      .filter((v) => v.trait === trait.key)
      .map((v) => ({ entry: v.variety, site: v.site ?? onlySite, value: v.value })),
  };
}

/** Which traits to analyse: every one, or one (listing them alone needs only `readTrial`). */
export type Analyse = 'all' | { trait: string };
const wanted = (analyse: Analyse, key: string) => analyse === 'all' || analyse.trait === key;

/**
 * What this caller may see of the trial, or null when nothing: the trial's own records for its
 * members, else its latest published version. Nothing is analysed yet.
 */
export async function readTrial(
  db: DB,
  actor: Actor | null,
  trial: Trial,
): Promise<TrialReading | null> {
  const { access } = await loadTrialAccess(db, trial, actor);
  if (can(actor, 'trial.read', access)) {
    const [traits, settings, entries] = await Promise.all([
      repo.trialTraits(db, trial.id),
      repo.sheetSettings(db, trial.id),
      repo.trialEntryNames(db, trial.id),
    ]);
    return {
      view: 'trial',
      version: null,
      entryNames: new Map(entries.map((e) => [e.id, e.name])),
      traits: traits.map((t) => ({ key: t.key, label: t.label })),
      snapshot: null,
      async analyse(which) {
        const figures: TraitFigures[] = [];
        const warnings: string[] = [];
        for (const t of traits) {
          if (!wanted(which, t.key)) continue;
          try {
            const a = await analyseTrialTrait(db, trial, {
              trait: t.key,
              basis: 'plot',
              alpha: settings?.alpha ?? 0.05,
              letters: settings?.letters ?? 'hsd',
            });
            figures.push(fromAnalysis(a));
          } catch (err) {
            if (!(err instanceof AppError) || err.status >= 500) throw err;
            warnings.push(`${t.label}: ${err.message}`);
          }
        }
        return { figures, warnings };
      },
    };
  }
  if (trial.status !== 'published') return null;
  let snapshot: ResultSnapshot;
  try {
    snapshot = await publicVersion(db, trial.slug);
  } catch (err) {
    if (err instanceof AppError && err.status === 404) return null;
    throw err;
  }
  return {
    view: 'sheet',
    version: snapshot.version,
    entryNames: new Map(snapshot.entries.map((e) => [e.id, e.name])),
    traits: snapshot.traits.map((t) => ({ key: t.key, label: t.label })),
    snapshot,
    analyse: (which) =>
      Promise.resolve({
        figures: snapshot.traits
          .filter((t) => wanted(which, t.key))
          .map((t) => fromSnapshot(snapshot, t)),
        warnings: [],
      }),
  };
}

/** The entry's arithmetic mean of plot values at each site. */
export function siteMeans(f: TraitFigures, entryName: string) {
  const bySite = new Map<string, { sum: number; n: number }>();
  for (const v of f.plotValues) {
    if (v.entry !== entryName) continue;
    const s = bySite.get(v.site) ?? { sum: 0, n: 0 };
    s.sum += v.value;
    s.n += 1;
    bySite.set(v.site, s);
  }
  return [...bySite].map(([site, s]) => ({ site, mean: s.sum / s.n, n: s.n }));
}
