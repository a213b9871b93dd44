/**
 * Every migration, in order. Listed by hand so the migrator works the same under tsx, Vitest
 * and a bundle; a test checks that every file in this folder appears here.
 */
import type { Migration } from 'kysely';
import * as accounts from './2026-12-01T0001-accounts';
import * as trials from './2026-12-01T0002-trials';
import * as invitations from './2026-12-01T0100-invitations';
import * as trialDesign from './2026-12-01T0200-trial-design';
import * as records from './2026-12-01T0250-records';
import * as dailyWeather from './2026-12-01T0300-daily-weather';
import * as photoFiles from './2026-12-01T0400-photo-files';
import * as results from './2026-12-01T0500-results';
import * as requestRateWindows from './2026-12-02T1300-request-rate-windows';
import * as followRequests from './2026-12-02T1400-follow-requests';
import * as signInThrottles from './2026-12-02T1410-sign-in-throttles';
import * as outgoingMail from './2026-12-02T2000-outgoing-mail';
import * as traitUnitsAndRanges from './2026-12-02T2100-trait-units-and-ranges';
import * as trialCopiedFrom from './2026-12-02T2200-trial-copied-from';
import * as photoUploadIds from './2026-12-02T3100-photo-upload-ids';
import * as sheetModel from './2026-12-02T3400-sheet-model';
import * as varietyRegister from './2026-12-02T3500-variety-register';
import * as trialDataVersion from './2026-12-02T3700-trial-data-version';
import * as harvestTotalsIndex from './2026-12-02T4200-harvest-totals-index';
import * as seedLots from './2026-12-02T4400-seed-lots';
import * as seedRequestMail from './2026-12-03T0400-seed-request-mail';
import * as varietyCoverPhoto from './2026-12-03T1300-variety-cover-photo';
import * as plotHarvestTotals from './2026-12-03T2200-plot-harvest-totals';
import * as incompleteBlocks from './2026-12-02T4500-incomplete-blocks';
import * as trialSecondFactor from './2026-12-02T4600-trial-second-factor';

export const migrations: Record<string, Migration> = {
  '2026-12-01T0001-accounts': accounts,
  '2026-12-01T0002-trials': trials,
  '2026-12-01T0100-invitations': invitations,
  '2026-12-01T0200-trial-design': trialDesign,
  '2026-12-01T0250-records': records,
  '2026-12-01T0300-daily-weather': dailyWeather,
  '2026-12-01T0400-photo-files': photoFiles,
  '2026-12-01T0500-results': results,
  '2026-12-02T1300-request-rate-windows': requestRateWindows,
  '2026-12-02T1400-follow-requests': followRequests,
  '2026-12-02T1410-sign-in-throttles': signInThrottles,
  '2026-12-02T2000-outgoing-mail': outgoingMail,
  '2026-12-02T2100-trait-units-and-ranges': traitUnitsAndRanges,
  '2026-12-02T2200-trial-copied-from': trialCopiedFrom,
  '2026-12-02T3100-photo-upload-ids': photoUploadIds,
  '2026-12-02T3400-sheet-model': sheetModel,
  '2026-12-02T3500-variety-register': varietyRegister,
  '2026-12-02T3700-trial-data-version': trialDataVersion,
  '2026-12-02T4200-harvest-totals-index': harvestTotalsIndex,
  '2026-12-02T4400-seed-lots': seedLots,
  '2026-12-02T4500-incomplete-blocks': incompleteBlocks,
  '2026-12-02T4600-trial-second-factor': trialSecondFactor,
  '2026-12-03T0400-seed-request-mail': seedRequestMail,
  '2026-12-03T1300-variety-cover-photo': varietyCoverPhoto,
  '2026-12-03T2200-plot-harvest-totals': plotHarvestTotals,
};
