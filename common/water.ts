/**
 * Depth of water applied, and a weekly water summary per site. Pure: numbers in, numbers out.
 * Depth in millimetres is litres per square metre (1 L spread over 1 m² stands 1 mm deep), so
 * every method reduces to litres applied ÷ wetted area, or a rate in mm/h × hours.
 */
import { dateOfDayNumber, dayNumber, weekStartOf } from './calendar-date';
import { LITRES_PER_US_GALLON, MM_PER_FOOT, MM_PER_INCH } from './units';

export type IrrigationInputs =
  | {
      method: 'drip';
      /** one emitter's flow, L/h */
      emitterFlowLPerH: number;
      /** distance between emitters along the line, mm */
      emitterSpacingMm: number;
      /** width of soil the line wets, mm */
      wettedWidthMm: number;
      runTimeMin: number;
    }
  | {
      method: 'drip';
      /** flow per metre of line (drip tape is rated this way), L/h per m */
      lineFlowLPerHPerM: number;
      wettedWidthMm: number;
      runTimeMin: number;
    }
  | { method: 'overhead'; sprinklerRateMmPerH: number; runTimeMin: number }
  | { method: 'hand'; volumeL: number; wettedAreaM2: number; runTimeMin: number };

function positive(name: string, value: number): number {
  if (!Number.isFinite(value) || value <= 0)
    throw new RangeError(`${name} must be a number above 0.`);
  return value;
}

/** Application rate of a drip line over the strip it wets, mm/h. */
export function dripRateMmPerH(inputs: Extract<IrrigationInputs, { method: 'drip' }>): number {
  const widthM = positive('Wetted width', inputs.wettedWidthMm) / 1000;
  const perMetre =
    'lineFlowLPerHPerM' in inputs
      ? positive('Line flow', inputs.lineFlowLPerHPerM)
      : positive('Emitter flow', inputs.emitterFlowLPerH) /
        (positive('Emitter spacing', inputs.emitterSpacingMm) / 1000);
  return perMetre / widthM;
}

/** Depth of water applied over the wetted area, mm. */
export function waterDepthMm(inputs: IrrigationInputs): number {
  const hours = positive('Run time', inputs.runTimeMin) / 60;
  switch (inputs.method) {
    case 'drip':
      return dripRateMmPerH(inputs) * hours;
    case 'overhead':
      return positive('Sprinkler rate', inputs.sprinklerRateMmPerH) * hours;
    case 'hand':
      return positive('Volume', inputs.volumeL) / positive('Wetted area', inputs.wettedAreaM2);
  }
}

/** The irrigation fields of a field event, in stored units, as stored or as sent. */
export interface IrrigationFields {
  irrigationMethod: IrrigationInputs['method'] | null;
  runTimeMin: number | null;
  dripEmitterFlowLPerH: number | null;
  dripEmitterSpacingMm: number | null;
  dripLineFlowLPerHPerM: number | null;
  wettedWidthMm: number | null;
  sprinklerRateMmPerH: number | null;
  handVolumeL: number | null;
  wettedAreaM2: number | null;
}

/**
 * The inputs of the depth of water from an irrigation event's fields (a drip line given by
 * its flow per length when that is filled in, else by its emitters), or null without a method.
 * A missing input is NaN, so `waterDepthMm` names it.
 */
export function irrigationInputsOf(e: IrrigationFields): IrrigationInputs | null {
  const runTimeMin = e.runTimeMin ?? NaN;
  switch (e.irrigationMethod) {
    case null:
      return null;
    case 'drip':
      return e.dripLineFlowLPerHPerM !== null
        ? {
            method: 'drip',
            lineFlowLPerHPerM: e.dripLineFlowLPerHPerM,
            wettedWidthMm: e.wettedWidthMm ?? NaN,
            runTimeMin,
          }
        : {
            method: 'drip',
            emitterFlowLPerH: e.dripEmitterFlowLPerH ?? NaN,
            emitterSpacingMm: e.dripEmitterSpacingMm ?? NaN,
            wettedWidthMm: e.wettedWidthMm ?? NaN,
            runTimeMin,
          };
    case 'overhead':
      return { method: 'overhead', sprinklerRateMmPerH: e.sprinklerRateMmPerH ?? NaN, runTimeMin };
    case 'hand':
      return {
        method: 'hand',
        volumeL: e.handVolumeL ?? NaN,
        wettedAreaM2: e.wettedAreaM2 ?? NaN,
        runTimeMin,
      };
    default: {
      // Every method is handled above; a new one in irrigationMethods stops the build here.
      const unhandled: never = e.irrigationMethod;
      throw new Error(`No irrigation inputs for the method ${String(unhandled)}.`);
    }
  }
}

/** Litres over square metres, as depth (mm). */
export const depthFromVolumeMm = (litres: number, areaM2: number) =>
  positive('Volume', litres) / positive('Area', areaM2);

// US customary inputs, converted with the exact definitions in common/units.ts.
export const gallonsToLitres = (gal: number) => gal * LITRES_PER_US_GALLON;
/** Drip tape is often rated in US gallons per hour per 100 ft of tape. */
export const gphPer100FtToLPerHPerM = (gph: number) =>
  gallonsToLitres(gph) / ((100 * MM_PER_FOOT) / 1000);
export const inchesPerHourToMmPerHour = (inPerH: number) => inPerH * MM_PER_INCH;
export const squareFeetToSquareMetres = (ft2: number) => ft2 * (MM_PER_FOOT / 1000) ** 2;

export interface WaterEvent {
  occurredOn: string;
  kind: string;
  rainMm: number | null;
  waterDepthMm: number | null;
}

export interface WaterWeek {
  /** the Monday that starts the week (ISO 8601 weeks), YYYY-MM-DD */
  weekStart: string;
  rainMm: number;
  irrigationMm: number;
  totalMm: number;
  rainEvents: number;
  irrigationEvents: number;
}

/**
 * Rain plus irrigation depth per week, every week from the first event to the last (weeks
 * with no water show as zero: a dry week matters as much as a wet one).
 */
export function weeklyWaterSummary(events: readonly WaterEvent[]): WaterWeek[] {
  const water = events.filter(
    (e) =>
      (e.kind === 'rainfall' && e.rainMm !== null) ||
      (e.kind === 'irrigation' && e.waterDepthMm !== null),
  );
  if (water.length === 0) return [];
  const byWeek = new Map<string, WaterWeek>();
  const starts = water.map((e) => weekStartOf(e.occurredOn)).sort();
  for (let d = dayNumber(starts[0]!); d <= dayNumber(starts.at(-1)!); d += 7) {
    const weekStart = dateOfDayNumber(d);
    byWeek.set(weekStart, {
      weekStart,
      rainMm: 0,
      irrigationMm: 0,
      totalMm: 0,
      rainEvents: 0,
      irrigationEvents: 0,
    });
  }
  for (const e of water) {
    const week = byWeek.get(weekStartOf(e.occurredOn))!;
    if (e.kind === 'rainfall') {
      week.rainMm += e.rainMm!;
      week.rainEvents += 1;
    } else {
      week.irrigationMm += e.waterDepthMm!;
      week.irrigationEvents += 1;
    }
    week.totalMm = week.rainMm + week.irrigationMm;
  }
  return [...byWeek.values()];
}
