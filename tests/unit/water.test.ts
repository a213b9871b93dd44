/** Depth of water applied and the weekly water summary, against handbook conversions. */
import { describe, expect, it } from 'vitest';
import { LITRES_PER_US_GALLON, M2_PER_ACRE, MM_PER_INCH } from '../../common/units';
import {
  depthFromVolumeMm,
  dripRateMmPerH,
  gallonsToLitres,
  gphPer100FtToLPerHPerM,
  inchesPerHourToMmPerHour,
  irrigationInputsOf,
  squareFeetToSquareMetres,
  waterDepthMm,
  weeklyWaterSummary,
} from '../../common/water';
import { weekStartOf } from '../../common/calendar-date';

const inchesOf = (mm: number) => mm / MM_PER_INCH;

describe('depth of water from a volume over an area', () => {
  it('1 L over 1 m² stands 1 mm deep (SI: 1 L = 1 dm³, so 0.001 m³ / 1 m² = 0.001 m)', () => {
    expect(depthFromVolumeMm(1, 1)).toBe(1);
    expect(depthFromVolumeMm(250, 10)).toBe(25);
  });

  it('one acre-inch is about 27,154 US gallons (USGS Water Science School figure)', () => {
    // 1 acre = 4046.8564224 m² and 1 in = 25.4 mm (NIST Handbook 44, Appendix C); the litres
    // of one inch over an acre, in US gallons of 231 in³.
    const litres = M2_PER_ACRE * MM_PER_INCH; // mm × m² = L
    const gallons = litres / LITRES_PER_US_GALLON;
    expect(Math.round(gallons)).toBe(27154);
    // Exactly 43,560 ft² × 1/12 ft × 1728 in³/ft³ ÷ 231 in³/gal = 6,272,640 / 231 gallons.
    expect(gallons).toBeCloseTo(6_272_640 / 231, 8);
    // And back: that many gallons over an acre is one inch.
    expect(inchesOf(depthFromVolumeMm(gallonsToLitres(6_272_640 / 231), M2_PER_ACRE))).toBeCloseTo(
      1,
      12,
    );
  });

  it('1 US gallon = 231 in³ exactly = 3.785411784 L (NIST Handbook 44, Appendix C)', () => {
    expect(LITRES_PER_US_GALLON).toBeCloseTo(3.785411784, 12);
    expect(gallonsToLitres(10)).toBeCloseTo(37.85411784, 10);
  });

  it('hand watering: 5 US gallons over 8 ft² is 231 × 5 / (8 × 144) in deep', () => {
    // 5 gal × 231 in³ spread over 8 × 144 in² (1 ft² = 144 in² by definition of the foot).
    const mm = waterDepthMm({
      method: 'hand',
      volumeL: gallonsToLitres(5),
      wettedAreaM2: squareFeetToSquareMetres(8),
      runTimeMin: 10,
    });
    expect(inchesOf(mm)).toBeCloseTo((231 * 5) / (8 * 144), 10);
  });
});

describe('drip lines', () => {
  it('gives 231 × GPH ÷ (spacing × width in inches) inches per hour for emitters', () => {
    // The in/h rate of a point source over its share of ground follows from 1 gal = 231 in³:
    // 1 gal/h on a 12 in × 12 in square is 231/144 in/h.
    const rate = dripRateMmPerH({
      method: 'drip',
      emitterFlowLPerH: gallonsToLitres(1),
      emitterSpacingMm: 12 * MM_PER_INCH,
      wettedWidthMm: 12 * MM_PER_INCH,
      runTimeMin: 60,
    });
    expect(inchesOf(rate)).toBeCloseTo(231 / 144, 10);
    // 0.5 gal/h emitters every 18 in wetting 10 in, run for 2 h.
    const depth = waterDepthMm({
      method: 'drip',
      emitterFlowLPerH: gallonsToLitres(0.5),
      emitterSpacingMm: 18 * MM_PER_INCH,
      wettedWidthMm: 10 * MM_PER_INCH,
      runTimeMin: 120,
    });
    expect(inchesOf(depth)).toBeCloseTo(((231 * 0.5) / (18 * 10)) * 2, 10);
  });

  it('metric emitters: 2 L/h every 0.30 m wetting 0.40 m apply 2 / 0.12 mm per hour', () => {
    expect(
      waterDepthMm({
        method: 'drip',
        emitterFlowLPerH: 2,
        emitterSpacingMm: 300,
        wettedWidthMm: 400,
        runTimeMin: 45,
      }),
    ).toBeCloseTo((2 / 0.12) * 0.75, 10);
  });

  it('tape rated per length: 0.45 GPH per 100 ft over a 12 in strip is the same as per-foot emitters', () => {
    // 0.45 gal/h spread along 100 ft is 0.0045 gal/h per foot; over 12 in of width that is
    // 231 × 0.0045 / (12 × 12) in/h.
    const rate = dripRateMmPerH({
      method: 'drip',
      lineFlowLPerHPerM: gphPer100FtToLPerHPerM(0.45),
      wettedWidthMm: 12 * MM_PER_INCH,
      runTimeMin: 60,
    });
    expect(inchesOf(rate)).toBeCloseTo((231 * 0.0045) / 144, 10);
  });

  it('refuses zero, negative and missing inputs instead of storing a wrong depth', () => {
    expect(() =>
      waterDepthMm({ method: 'drip', lineFlowLPerHPerM: 5, wettedWidthMm: 0, runTimeMin: 30 }),
    ).toThrow('Wetted width must be a number above 0.');
    expect(() =>
      waterDepthMm({ method: 'overhead', sprinklerRateMmPerH: 10, runTimeMin: -5 }),
    ).toThrow('Run time must be a number above 0.');
    expect(() =>
      waterDepthMm({ method: 'overhead', sprinklerRateMmPerH: Number.NaN, runTimeMin: 5 }),
    ).toThrow('Sprinkler rate must be a number above 0.');
  });
});

describe("an event's stored irrigation fields as depth inputs", () => {
  const none = {
    runTimeMin: 60,
    dripEmitterFlowLPerH: null,
    dripEmitterSpacingMm: null,
    dripLineFlowLPerHPerM: null,
    wettedWidthMm: 12 * MM_PER_INCH,
    sprinklerRateMmPerH: null,
    handVolumeL: null,
    wettedAreaM2: null,
  };

  it('reads a drip line by its flow per length when given, else by its emitters', () => {
    const byLine = irrigationInputsOf({
      ...none,
      irrigationMethod: 'drip',
      dripLineFlowLPerHPerM: gphPer100FtToLPerHPerM(0.45),
      dripEmitterFlowLPerH: 2,
    })!;
    // The same tape as above: 231 × 0.0045 / 144 in over an hour.
    expect(inchesOf(waterDepthMm(byLine))).toBeCloseTo((231 * 0.0045) / 144, 10);
    const byEmitters = irrigationInputsOf({
      ...none,
      irrigationMethod: 'drip',
      dripEmitterFlowLPerH: gallonsToLitres(1),
      dripEmitterSpacingMm: 12 * MM_PER_INCH,
    })!;
    // 1 gal/h per foot of line over a 12 in strip: 231 / 144 in per hour.
    expect(inchesOf(waterDepthMm(byEmitters))).toBeCloseTo(231 / 144, 10);
  });

  it('has no inputs without a method, and names a missing one when the depth is asked for', () => {
    expect(irrigationInputsOf({ ...none, irrigationMethod: null })).toBeNull();
    expect(() => waterDepthMm(irrigationInputsOf({ ...none, irrigationMethod: 'hand' })!)).toThrow(
      'Volume must be a number above 0.',
    );
  });
});

describe('overhead sprinklers', () => {
  it('0.5 in/h for 90 minutes applies 0.75 in (rate × time)', () => {
    const mm = waterDepthMm({
      method: 'overhead',
      sprinklerRateMmPerH: inchesPerHourToMmPerHour(0.5),
      runTimeMin: 90,
    });
    expect(mm).toBeCloseTo(0.75 * 25.4, 10);
  });
});

describe('weekly water summary', () => {
  it('starts weeks on Monday, as ISO 8601 does (2024-01-01 was a Monday)', () => {
    expect(weekStartOf('2024-01-01')).toBe('2024-01-01');
    expect(weekStartOf('2024-01-07')).toBe('2024-01-01'); // Sunday
    expect(weekStartOf('2024-01-08')).toBe('2024-01-08');
    expect(weekStartOf('2024-03-01')).toBe('2024-02-26'); // across a leap day
  });

  it('adds rain and irrigation per week, with dry weeks shown as zero', () => {
    const weeks = weeklyWaterSummary([
      { occurredOn: '2024-07-01', kind: 'rainfall', rainMm: 12.5, waterDepthMm: null },
      { occurredOn: '2024-07-03', kind: 'irrigation', rainMm: null, waterDepthMm: 10 },
      { occurredOn: '2024-07-07', kind: 'rainfall', rainMm: 3, waterDepthMm: null },
      { occurredOn: '2024-07-05', kind: 'fertilizer', rainMm: null, waterDepthMm: null },
      { occurredOn: '2024-07-22', kind: 'irrigation', rainMm: null, waterDepthMm: 20 },
    ]);
    expect(weeks).toEqual([
      {
        weekStart: '2024-07-01',
        rainMm: 15.5,
        irrigationMm: 10,
        totalMm: 25.5,
        rainEvents: 2,
        irrigationEvents: 1,
      },
      {
        weekStart: '2024-07-08',
        rainMm: 0,
        irrigationMm: 0,
        totalMm: 0,
        rainEvents: 0,
        irrigationEvents: 0,
      },
      {
        weekStart: '2024-07-15',
        rainMm: 0,
        irrigationMm: 0,
        totalMm: 0,
        rainEvents: 0,
        irrigationEvents: 0,
      },
      {
        weekStart: '2024-07-22',
        rainMm: 0,
        irrigationMm: 20,
        totalMm: 20,
        rainEvents: 0,
        irrigationEvents: 1,
      },
    ]);
    expect(weeklyWaterSummary([])).toEqual([]);
  });
});
