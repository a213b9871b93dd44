import { createHash } from 'node:crypto';
import { parse } from 'csv-parse/sync';
import { decimalsFor, exportNumber, recordedDecimals } from '../../common/precision';
import type {
  ExportDataset,
  ImportedRecord,
  ImportKind,
  ImportPreview,
} from '../../common/contracts/records';
import { storedUnitOf } from '../../common/contracts/records';
import {
  type CsvCheck,
  type CsvLookups,
  type ParsedHarvestRow,
  type ParsedObservationRow,
  type CsvPlot,
  type CsvTrait,
  checkHarvestCsv,
  checkObservationCsv,
  checkRecordingSheetCsv,
  harvestCsvColumns,
  observationCsvColumns,
  recordCsvHeader,
} from '../../common/csv-records';
import type { Actor } from '../../common/policy';
import type { DB } from '../../db/database';
import { AppError } from '../lib/app-error';
import { authorize, type LoadedTrial } from '../trials/trial-access';
import { trialFactor, trialForAction } from '../trials/trials-service';
import { createOnce } from './record-changes';
import { fromSpreadsheetSafe, treatmentColumn, writeCsv } from '../../common/csv';
import * as repo from './records-repository';
import { requireActorOf } from './records-actor';

/**
 * A record id made from the trial, plot, date and sheet column: stable across imports of the
 * same sheet. Formatted as a version-8 UUID (RFC 9562, custom bits).
 */
export function sheetRecordId(trialId: string, plotId: string, date: string, column: string) {
  const h = createHash('sha256')
    .update(`recording-sheet\n${trialId}\n${plotId}\n${date}\n${column}`)
    .digest('hex');
  const variant = ((parseInt(h[16]!, 16) & 0x3) | 0x8).toString(16);
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-8${h.slice(13, 16)}-${variant}${h.slice(17, 20)}-${h.slice(20, 32)}`;
}

function parseCsv(text: string): string[][] {
  try {
    const rows = parse(text.replace(/^\uFEFF/, ''), {
      relax_column_count: true,
      skip_empty_lines: false,
      trim: false,
    }) as string[][];
    return rows.map((r) => r.map(fromSpreadsheetSafe));
  } catch (err) {
    const e = err as { message?: string; lines?: number };
    throw new AppError(
      'validation_failed',
      `The file is not valid CSV: ${e.message ?? ''}`.trim(),
      {
        rows: [{ row: e.lines ?? 1, column: '', message: 'The file is not valid CSV here.' }],
      },
    );
  }
}

async function lookupsFor(
  db: DB,
  trialId: string,
  factorName: string | null,
): Promise<{ lookups: CsvLookups; plotSite: Map<string, string> }> {
  const [plots, traits, sites] = await Promise.all([
    repo.plotsOfTrial(db, trialId),
    repo.traitsOfTrial(db, trialId),
    db.selectFrom('sites').select(['id', 'name']).where('trial_id', '=', trialId).execute(),
  ]);
  const byKey = new Map<string, CsvPlot>();
  const plotSite = new Map<string, string>();
  for (const p of plots) {
    byKey.set(`${p.siteName.toLowerCase()}#${p.plotNumber}`, {
      id: p.plotId,
      entryCode: p.entryCode,
      label: `${p.siteName} plot ${p.plotNumber} (${p.entryCode})`,
    });
    plotSite.set(p.plotId, p.siteId);
  }
  const traitByKey = new Map<string, CsvTrait>(
    traits.map((t) => [
      t.key,
      {
        id: t.id,
        key: t.key,
        label: t.label,
        quantityKind: t.quantity_kind,
        basis: t.basis,
        scaleMin: t.scale_min,
        scaleMax: t.scale_max,
      },
    ]),
  );
  return {
    lookups: {
      siteNames: sites.map((s) => s.name),
      plot: (site, n) => byKey.get(`${site.toLowerCase()}#${n}`),
      trait: (key) => traitByKey.get(key.toLowerCase()),
      traits: [...traitByKey.values()],
      factorName,
    },
    plotSite,
  };
}

interface Checked {
  loaded: LoadedTrial;
  forbiddenRows: number[];
  preview: ImportPreview;
  write: (trx: DB, actor: Actor) => Promise<number>;
}

async function check(
  db: DB,
  slug: string,
  actor: Actor | null,
  kind: ImportKind,
  csv: string,
): Promise<Checked> {
  const loaded = await trialForAction(db, slug, actor, 'records.write');
  const { lookups, plotSite } = await lookupsFor(
    db,
    loaded.trial.id,
    trialFactor(loaded.trial)?.name ?? null,
  );
  const rows = parseCsv(csv);
  const result: CsvCheck<ParsedHarvestRow | ParsedObservationRow> =
    kind === 'harvests'
      ? checkHarvestCsv(rows, lookups)
      : kind === 'observations'
        ? checkObservationCsv(rows, lookups)
        : checkRecordingSheetCsv(rows, lookups);
  // A sheet's records have no ids of their own: each gets one from where it was written, so the
  // same sheet imported twice is recorded once.
  for (const r of result.records)
    if (r.id === null && r.source)
      r.id = sheetRecordId(
        loaded.trial.id,
        r.plot.id,
        'harvestedOn' in r ? r.harvestedOn : r.observedOn,
        r.source,
      );
  const errors = [...result.errors];
  // Growers import only at their own sites; the whole file is refused otherwise.
  const forbiddenRows: number[] = [];
  for (const r of result.records) {
    try {
      authorize(actor, 'records.write', loaded, plotSite.get(r.plot.id)!);
    } catch {
      forbiddenRows.push(r.row);
      errors.push({ row: r.row, column: 'site', message: 'You may not record at this site.' });
    }
  }
  const idsIn = (harvests: boolean) =>
    result.records
      .filter((r) => 'harvestedOn' in r === harvests)
      .map((r) => r.id)
      .filter((id): id is string => id !== null);
  const existing = new Map(
    [
      ...(await repo.existingIds(db, 'harvests', idsIn(true))),
      ...(await repo.existingIds(db, 'observations', idsIn(false))),
    ].map((e) => [e.id, e.trial_id]),
  );
  const already = new Set<(typeof result.records)[number]>();
  for (const r of result.records) {
    if (!r.id || !existing.has(r.id)) continue;
    if (existing.get(r.id) === loaded.trial.id) already.add(r);
    else r.id = null; // an id from another trial's export: a new record here
  }
  const errorRows = new Set(errors.map((e) => e.row));
  const recordOf = (r: (typeof result.records)[number]): ImportedRecord =>
    'harvestedOn' in r
      ? {
          kind: 'harvest',
          date: r.harvestedOn,
          fruitCount: r.fruitCount,
          massG: r.massG,
          grade: r.grade,
        }
      : {
          kind: 'observation',
          date: r.observedOn,
          traitKey: r.trait.key,
          traitLabel: r.trait.label,
          plantNumber: r.plantNumber,
          value: r.value,
          valueDate: r.valueDate,
        };
  const preview: ImportPreview = {
    kind,
    columns: result.columns,
    rows: result.records.map((r) => ({
      row: r.row,
      status: errorRows.has(r.row) ? 'error' : already.has(r) ? 'already_recorded' : 'new',
      plotLabel: r.plot.label,
      record: recordOf(r),
    })),
    errors: errors.sort((a, b) => a.row - b.row),
    newCount: result.records.filter((r) => !already.has(r) && !errorRows.has(r.row)).length,
    alreadyRecordedCount: already.size,
  };
  const fresh = result.records.filter((r) => !already.has(r));
  return {
    loaded,
    forbiddenRows,
    preview,
    write: async (trx, who) => {
      for (const r of fresh) {
        const id = r.id ?? crypto.randomUUID();
        if ('harvestedOn' in r) {
          await createOnce(
            trx,
            'harvests',
            loaded.trial.id,
            {
              id,
              plot_id: r.plot.id,
              harvested_on: r.harvestedOn,
              fruit_count: r.fruitCount,
              mass_g: r.massG,
              grade: r.grade,
              note: r.note,
            },
            who,
            ['plot_id'],
          );
        } else {
          await createOnce(
            trx,
            'observations',
            loaded.trial.id,
            {
              id,
              plot_id: r.plot.id,
              trait_id: r.trait.id,
              observed_on: r.observedOn,
              value: r.value,
              value_date: r.valueDate,
              plant_number: r.plantNumber,
              note: r.note,
            },
            who,
            ['plot_id', 'trait_id'],
          );
        }
      }
      return fresh.length;
    },
  };
}

export async function previewImport(
  db: DB,
  slug: string,
  actor: Actor | null,
  kind: ImportKind,
  csv: string,
) {
  return (await check(db, slug, actor, kind, csv)).preview;
}

/** All or nothing: any row with a problem refuses the file, and the rows go in one transaction. */
export async function commitImport(
  db: DB,
  slug: string,
  actor: Actor | null,
  kind: ImportKind,
  csv: string,
) {
  const { preview, write, forbiddenRows } = await check(db, slug, actor, kind, csv);
  if (forbiddenRows.length) {
    const rows = [...new Set(forbiddenRows)];
    throw new AppError(
      'forbidden',
      `${rows.length === 1 ? 'Row' : 'Rows'} ${rows.join(', ')} ${rows.length === 1 ? 'is' : 'are'} at a site where you may not record; nothing was imported.`,
      { rows: preview.errors },
    );
  }
  if (preview.errors.length) {
    const rowsWithErrors = [...new Set(preview.errors.map((e) => e.row))];
    throw new AppError(
      'validation_failed',
      `${rowsWithErrors.length === 1 ? 'Row' : 'Rows'} ${rowsWithErrors.join(', ')} ${rowsWithErrors.length === 1 ? 'has' : 'have'} problems; nothing was imported.`,
      { rows: preview.errors },
    );
  }
  const created = await db.transaction().execute((trx) => write(trx, requireActorOf(actor)));
  return { created, alreadyRecorded: preview.alreadyRecordedCount };
}

// ---------- Export ----------

export async function exportDataset(
  db: DB,
  slug: string,
  actor: Actor | null,
  dataset: ExportDataset,
) {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  const filename = `${trial.slug}-${dataset}.csv`;
  // A two-factor trial's records carry their plot's level of the treatment, under its name.
  const factorName = trialFactor(trial)?.name ?? null;
  const level = (r: { treatment: string | null }) => (factorName ? [r.treatment ?? ''] : []);
  if (dataset === 'harvests') {
    const rows = await repo.listHarvests(db, trial.id, {});
    return {
      filename,
      body: writeCsv(
        recordCsvHeader(harvestCsvColumns, factorName),
        rows.map((h) => [
          h.id,
          h.siteName,
          h.plotNumber,
          h.entryCode,
          ...level(h),
          h.harvestedOn,
          h.fruitCount,
          h.massG,
          h.grade,
          h.note,
        ]),
      ),
    };
  }
  if (dataset === 'observations') {
    const rows = await repo.listObservations(db, trial.id, {});
    return {
      filename,
      body: writeCsv(
        recordCsvHeader(observationCsvColumns, factorName),
        rows.map((o) => [
          o.id,
          o.siteName,
          o.plotNumber,
          o.entryCode,
          ...level(o),
          o.traitKey,
          o.observedOn,
          o.plantNumber ?? '',
          o.value ?? '',
          o.value === null ? '' : storedUnitOf(o.quantityKind),
          o.valueDate ?? '',
          o.note,
        ]),
      ),
    };
  }
  if (dataset === 'field-events') {
    const rows = await repo.listFieldEvents(db, trial.id, {});
    const columns = [
      'record_id',
      'site',
      'plot_number',
      'kind',
      'occurred_on',
      'irrigation_method',
      'run_time_min',
      'water_depth_mm',
      'drip_emitter_flow_l_per_h',
      'drip_emitter_spacing_mm',
      'drip_line_flow_l_per_h_per_m',
      'wetted_width_mm',
      'sprinkler_rate_mm_per_h',
      'hand_volume_l',
      'wetted_area_m2',
      'rain_mm',
      'amendment_kind',
      'rate_g_per_m2',
      'none_applied',
      'target_spacing_mm',
      'note',
    ];
    return {
      filename,
      body: writeCsv(
        columns,
        rows.map((e) => [
          e.id,
          e.siteName,
          e.plotNumber ?? '',
          e.kind,
          e.occurredOn,
          e.irrigationMethod ?? '',
          e.runTimeMin ?? '',
          e.waterDepthMm ?? '',
          e.dripEmitterFlowLPerH ?? '',
          e.dripEmitterSpacingMm ?? '',
          e.dripLineFlowLPerHPerM ?? '',
          e.wettedWidthMm ?? '',
          e.sprinklerRateMmPerH ?? '',
          e.handVolumeL ?? '',
          e.wettedAreaM2 ?? '',
          e.rainMm ?? '',
          e.amendmentKind ?? '',
          e.rateGPerM2 ?? '',
          e.noneApplied,
          e.targetSpacingMm ?? '',
          e.note,
        ]),
      ),
    };
  }
  // Plot-level totals: one row per plot, harvest sums and the mean of each numeric trait.
  const [plots, harvests, observations, traits] = await Promise.all([
    repo.plotsOfTrial(db, trial.id),
    repo.listHarvests(db, trial.id, {}),
    repo.listObservations(db, trial.id, {}),
    repo.traitsOfTrial(db, trial.id),
  ]);
  const numeric = traits.filter((t) => t.quantity_kind !== 'date');
  // A two-factor trial's plots carry their level of the treatment, under the treatment's name.
  const factor = trialFactor(trial);
  // Sums keep the recorded decimals, plot means one more (common/precision.ts).
  const massDecimals = recordedDecimals(harvests.map((h) => h.massG));
  const traitDecimals = new Map(
    numeric.map((t) => [
      t.id,
      decimalsFor(
        'mean',
        recordedDecimals(
          observations.filter((o) => o.traitId === t.id && o.value !== null).map((o) => o.value!),
        ),
      ),
    ]),
  );
  const columns = [
    'site',
    'plot_number',
    'block',
    'entry_code',
    'entry_name',
    ...(factor ? ['treatment'] : []),
    'plants_set',
    'plants_surviving',
    'harvests',
    'fruit_count_marketable',
    'fruit_count_cull',
    'mass_marketable_g',
    'mass_cull_g',
    'mass_total_g',
    ...numeric.flatMap((t) => [`${t.key}_mean_${storedUnitOf(t.quantity_kind)}`, `${t.key}_n`]),
  ];
  const rows = plots.map((p) => {
    const hs = harvests.filter((h) => h.plotId === p.plotId);
    const sum = (grade: string, f: (h: (typeof hs)[number]) => number) =>
      hs.filter((h) => h.grade === grade).reduce((a, h) => a + f(h), 0);
    const massM = sum('marketable', (h) => h.massG);
    const massC = sum('cull', (h) => h.massG);
    const traitCells = numeric.flatMap((t) => {
      const values = observations
        .filter((o) => o.plotId === p.plotId && o.traitId === t.id && o.value !== null)
        .map((o) => o.value!);
      return values.length
        ? [
            exportNumber(
              values.reduce((a, v) => a + v, 0) / values.length,
              traitDecimals.get(t.id) ?? 0,
            ),
            values.length,
          ]
        : ['', 0];
    });
    return [
      p.siteName,
      p.plotNumber,
      p.block,
      p.entryCode,
      p.entryName,
      ...(factor ? [p.treatment ?? ''] : []),
      p.plantsSet ?? '',
      p.plantsSurviving ?? '',
      hs.length,
      sum('marketable', (h) => h.fruitCount),
      sum('cull', (h) => h.fruitCount),
      exportNumber(massM, massDecimals),
      exportNumber(massC, massDecimals),
      exportNumber(massM + massC, massDecimals),
      ...traitCells,
    ];
  });
  const header = factor
    ? columns.map((c) => (c === 'treatment' ? treatmentColumn(factor.name, columns) : c))
    : columns;
  return { filename, body: writeCsv(header, rows) };
}
