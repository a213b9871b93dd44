/**
 * The typed shape of the migrated database. A test compares every table and column here with
 * the real migrated schema, so this file cannot drift from db/migrations.
 */
import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';
// Enumerations come from the one list each in common/contracts (the database's checks match them).
import type { analysisModels, letterMethods } from '../common/contracts/analysis';
import type { MailKind, MailStatus } from '../common/contracts/mail';
import type {
  fertilizerPolicies,
  irrigationMethods as siteIrrigationMethods,
} from '../common/contracts/design';
import type { unitSystems } from '../common/contracts/me';
import type { groupRoles, varietyTypes } from '../common/contracts/varieties';
import type { photoSubjects } from '../common/contracts/photos';
import type { AmountUnit, OfferStatus, SeedRequestStatus } from '../common/contracts/seed';
import type {
  auditActions,
  auditTables,
  fieldEventKinds,
  harvestGrades,
} from '../common/contracts/records';
import type {
  entryTypes,
  FactorArrangement,
  quantityKinds,
  traitBases,
  traitDirections,
  traitDisplayUnits,
  trialDesigns,
  trialRoles,
  trialStatuses,
} from '../common/contracts/trials';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;
/** `date` columns travel as 'YYYY-MM-DD' text (see the pg type parser in db/database.ts). */
type DateText = ColumnType<string, string, string>;

interface Written {
  created_at: Timestamp;
  updated_at: Timestamp;
  created_by: string | null;
  updated_by: string | null;
}

export interface UsersTable {
  id: string;
  name: string;
  email: string;
  email_verified: boolean;
  image: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  unit_system: Generated<(typeof unitSystems)[number]>;
  is_admin: Generated<boolean>;
}

export interface SessionsTable {
  id: string;
  expires_at: Timestamp;
  token: string;
  created_at: Timestamp;
  updated_at: Timestamp;
  ip_address: string | null;
  user_agent: string | null;
  user_id: string;
}

export interface AccountsTable {
  id: string;
  account_id: string;
  provider_id: string;
  user_id: string;
  access_token: string | null;
  refresh_token: string | null;
  id_token: string | null;
  access_token_expires_at: Timestamp | null;
  refresh_token_expires_at: Timestamp | null;
  scope: string | null;
  password: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export interface VerificationsTable {
  id: string;
  identifier: string;
  value: string;
  expires_at: Timestamp;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export interface RateLimitsTable {
  id: string;
  key: string;
  count: number;
  last_request: ColumnType<string, number | string, number | string>;
}

export type TrialDesign = (typeof trialDesigns)[number];
export type TrialStatus = (typeof trialStatuses)[number];

export interface TrialsTable extends Written {
  id: Generated<string>;
  slug: string;
  title: string;
  crop: string;
  season: string;
  design: TrialDesign;
  status: Generated<TrialStatus>;
  description: Generated<string>;
  sowing_date: DateText | null;
  transplant_date: DateText | null;
  layout_seed: number | null;
  replicates: number | null;
  rows_per_plot: Generated<number>;
  row_length_mm: number | null;
  row_spacing_mm: number | null;
  in_row_spacing_mm: number | null;
  layout_generated_at: Timestamp | null;
  /** Entries per block (incomplete blocks) or per garden (network); null for other designs. */
  block_size: Generated<number | null>;
  fertilizer_policy: Generated<FertilizerPolicy>;
  fertilizer_notes: Generated<string>;
  /** The trial this one was copied from for a new season. */
  copied_from_trial_id: Generated<string | null>;
  /** The group that owns the trial (its register holds the trial's varieties). */
  group_id: Generated<string | null>;
  /** Moved on by triggers at every change to the trial's data; keys what is computed from it. */
  data_version: Generated<number>;
  /** The second factor (a treatment such as fertilizer), or null for a one-factor trial. */
  factor_name: Generated<string | null>;
  /** Its levels in the lead's order (two or more). */
  factor_levels: Generated<string[] | null>;
  factor_arrangement: Generated<FactorArrangement | null>;
}

/** The lead's planned fertilizer use; what was applied is in the field log. */
export type FertilizerPolicy = (typeof fertilizerPolicies)[number];

export interface SitesTable extends Written {
  id: Generated<string>;
  trial_id: string;
  name: string;
  region: Generated<string>;
  soil_texture: string | null;
  irrigation_method: (typeof siteIrrigationMethods)[number] | null;
  notes: Generated<string>;
}

export interface EntriesTable extends Written {
  id: Generated<string>;
  trial_id: string;
  name: string;
  code: string;
  seed_source: Generated<string>;
  seed_lot: Generated<string>;
  entry_type: (typeof entryTypes)[number];
  days_to_maturity_claimed: number | null;
  notes: Generated<string>;
  in_row_spacing_mm: number | null;
  no_fertilizer: Generated<boolean>;
  /** The register variety this entry grows (in the trial's group's register). */
  variety_id: Generated<string | null>;
  /** The lot of that variety the entry was sown from (cleared when the variety changes). */
  lot_id: Generated<string | null>;
}

/** An organisation owning several trials (a seed library, a grower network). */
export interface GroupsTable {
  id: Generated<string>;
  slug: string;
  name: string;
  /** A lot whose newest germination test is below this is flagged. */
  germination_threshold_percent: Generated<number>;
  /** Anyone signed in with a confirmed e-mail may ask for offered seed, not only members. */
  seed_requests_open: Generated<boolean>;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
  created_by: string | null;
  updated_by: string | null;
}

export type GroupRole = (typeof groupRoles)[number];

export interface GroupMembersTable {
  group_id: string;
  user_id: string;
  role: GroupRole;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
  created_by: string | null;
  updated_by: Generated<string | null>;
}

/** A variety in a group's register, followed from trial to trial. */
export interface VarietiesTable {
  id: Generated<string>;
  group_id: string;
  slug: string;
  name: string;
  crop: string;
  variety_type: Generated<(typeof varietyTypes)[number]>;
  origin: Generated<string>;
  seed_source: Generated<string>;
  description: Generated<string>;
  expected_traits: Generated<string[]>;
  aliases: Generated<string[]>;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
  created_by: string | null;
  updated_by: string | null;
  /** The variety's own cover, a photo of one of its entries (cleared when the photo goes). */
  cover_photo_id: Generated<string | null>;
}

export interface PlotsTable extends Written {
  id: Generated<string>;
  trial_id: string;
  site_id: string;
  entry_id: string;
  block: number;
  position: number;
  plot_number: number;
  /** Incomplete blocks and networks: the replicate the plot's block belongs to. */
  replicate: Generated<number | null>;
  plants_set: number | null;
  plants_surviving: number | null;
  in_row_spacing_mm: number | null;
  row_length_mm: number | null;
  row_spacing_mm: number | null;
  gaps: number | null;
  planted_note: Generated<string>;
  /** The plot's level of the trial's second factor (null in a one-factor trial). */
  treatment: Generated<string | null>;
}

export type QuantityKind = (typeof quantityKinds)[number];
export type TraitBasis = (typeof traitBases)[number];
export type TraitDirection = (typeof traitDirections)[number];
export type TraitDisplayUnit = (typeof traitDisplayUnits)[number];

export interface TraitsTable extends Written {
  id: Generated<string>;
  trial_id: string;
  key: string;
  label: string;
  quantity_kind: QuantityKind;
  basis: TraitBasis;
  direction: TraitDirection;
  scale_min: number | null;
  scale_max: number | null;
  sort_order: Generated<number>;
  /** The lead's unit for showing and typing the trait; null: chosen from its kind. */
  display_unit: TraitDisplayUnit | null;
  /** Values outside are asked about before saving and flagged in tables, never refused. */
  plausible_min: number | null;
  plausible_max: number | null;
}

interface Versioned {
  version: Generated<number>;
  deleted_at: Timestamp | null;
}

export interface HarvestsTable extends Written, Versioned {
  id: Generated<string>;
  trial_id: string;
  plot_id: string;
  harvested_on: DateText;
  fruit_count: number;
  mass_g: number;
  grade: (typeof harvestGrades)[number];
  note: Generated<string>;
}

/**
 * Each plot's live harvests added up, kept by triggers on harvests (never written by the app).
 * Masses are numeric, which pg hands over as text: read them cast to float8.
 */
export interface PlotHarvestTotalsTable {
  plot_id: string;
  trial_id: string;
  harvests: number;
  fruit_count: number;
  mass_g: string;
  marketable_fruit_count: number;
  marketable_mass_g: string;
  harvest_days: number;
  first_harvested_on: DateText;
  last_harvested_on: DateText;
  mass_decimals: number;
}

export interface ObservationsTable extends Written, Versioned {
  id: Generated<string>;
  trial_id: string;
  plot_id: string;
  trait_id: string;
  observed_on: DateText;
  value: number | null;
  value_date: DateText | null;
  plant_number: number | null;
  note: Generated<string>;
}

export type FieldEventKind = (typeof fieldEventKinds)[number];

export interface FieldEventsTable extends Written, Versioned {
  id: Generated<string>;
  trial_id: string;
  site_id: string;
  plot_id: string | null;
  kind: FieldEventKind;
  occurred_on: DateText;
  irrigation_method: 'drip' | 'overhead' | 'hand' | 'furrow' | null;
  run_time_min: number | null;
  water_depth_mm: number | null;
  rain_mm: number | null;
  amendment_kind: string | null;
  rate_g_per_m2: number | null;
  none_applied: Generated<boolean>;
  target_spacing_mm: number | null;
  note: Generated<string>;
  drip_emitter_flow_l_per_h: number | null;
  drip_emitter_spacing_mm: number | null;
  drip_line_flow_l_per_h_per_m: number | null;
  wetted_width_mm: number | null;
  sprinkler_rate_mm_per_h: number | null;
  hand_volume_l: number | null;
  wetted_area_m2: number | null;
}

export type AuditTable = (typeof auditTables)[number];
export type AuditAction = (typeof auditActions)[number];

export interface AuditLogTable {
  id: Generated<number>;
  trial_id: string;
  table_name: AuditTable;
  record_id: string;
  action: AuditAction;
  before: ColumnType<Record<string, unknown> | null, string | null, string | null>;
  after: ColumnType<Record<string, unknown>, string, string>;
  actor_id: string | null;
  at: Timestamp;
}

export interface PhotosTable extends Written {
  id: Generated<string>;
  trial_id: string;
  entry_id: string | null;
  plot_id: string | null;
  taken_on: DateText | null;
  caption: string;
  subject: (typeof photoSubjects)[number] | null;
  storage_key: string;
  width: number | null;
  height: number | null;
  bytes: number | null;
  deleted_at: Timestamp | null;
  mime_type: PhotoMimeType;
  original_ext: 'jpg' | 'png' | 'webp' | 'avif';
  sha256: string | null;
  display_width: number | null;
  display_height: number | null;
  display_bytes: number | null;
  thumb_width: number | null;
  thumb_height: number | null;
  thumb_bytes: number | null;
  captured_at: Timestamp | null;
  is_cover: Generated<boolean>;
  purge_after: Timestamp | null;
  purged_at: Timestamp | null;
  /** the device-made id of the upload that brought the photo, and its place in that upload */
  upload_id: string | null;
  upload_index: number | null;
}

export type PhotoMimeType = 'image/jpeg' | 'image/png' | 'image/webp' | 'image/avif';

export type TrialRole = (typeof trialRoles)[number];

export interface TrialMembersTable extends Written {
  trial_id: string;
  user_id: string;
  role: TrialRole;
}

export interface TrialMemberSitesTable {
  trial_id: string;
  user_id: string;
  site_id: string;
  created_at: Timestamp;
  created_by: string | null;
}

export interface InvitationsTable {
  id: Generated<string>;
  trial_id: string;
  email: string;
  role: TrialRole;
  token_hash: string;
  invited_by: string | null;
  expires_at: Timestamp;
  accepted_at: Timestamp | null;
  accepted_by: string | null;
  revoked_at: Timestamp | null;
  revoked_by: string | null;
  send_attempts: Generated<number>;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
}

export interface InvitationSitesTable {
  invitation_id: string;
  trial_id: string;
  site_id: string;
}

export interface ResultsSheetsTable {
  trial_id: string;
  summary: Generated<string>;
  methods: string | null;
  /** JSON text on write; parsed on read by pg */
  traits: ColumnType<unknown, string | undefined, string>;
  entry_notes: ColumnType<unknown, string | undefined, string>;
  cover_photos: ColumnType<unknown, string | undefined, string>;
  alpha: Generated<number>;
  letters: Generated<(typeof letterMethods)[number]>;
  /** The lead's model; null: the one the trial's design suggests. */
  model: (typeof analysisModels)[number] | null;
  license: Generated<string>;
  created_at: Timestamp;
  updated_at: Timestamp;
  created_by: string | null;
  updated_by: string | null;
}

export interface ResultVersionsTable {
  id: Generated<string>;
  trial_id: string;
  version: number;
  change_note: Generated<string>;
  snapshot: ColumnType<unknown, string, never>;
  published_at: Timestamp;
  published_by: string | null;
}

export interface ResultFollowersTable {
  id: Generated<string>;
  trial_id: string;
  email: string;
  confirm_token_hash: string;
  unsubscribe_token: string;
  confirmed_at: Timestamp | null;
  unsubscribed_at: Timestamp | null;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export interface FollowRequestsTable {
  id: Generated<number>;
  trial_id: string;
  email: string;
  client_ip: string;
  mailed: boolean;
  requested_at: Timestamp;
}

export interface SignInThrottlesTable {
  email: string;
  failures: number;
  last_failure_at: Timestamp;
  blocked_until: Timestamp | null;
}

export interface DailyWeatherTable extends Written {
  id: Generated<string>;
  trial_id: string;
  site_id: string;
  observed_on: DateText;
  tmin_c: number | null;
  tmax_c: number | null;
  rain_mm: number | null;
  source: Generated<'manual' | 'import' | 'demo'>;
  note: Generated<string>;
}

/** Every message the app sends, queued (server/mail/mail-queue.ts) and its outcome kept. */
export interface OutgoingMailTable {
  id: Generated<string>;
  kind: MailKind;
  trial_id: string | null;
  invitation_id: string | null;
  recipient: string;
  subject: string;
  /** The message until it is sent or given up; null after. */
  body: ColumnType<QueuedMailBody | null, string | null, string | null>;
  status: Generated<MailStatus>;
  attempts: Generated<number>;
  last_error: string | null;
  created_at: Generated<Date>;
  sent_at: Timestamp | null;
}

export interface QueuedMailBody {
  text: string;
  html: string;
  headers?: Record<string, string>;
}

/** Request counts per caller and fixed window, for rate limits (server/lib/rate-limit.ts). */
export interface RequestRateWindowsTable {
  bucket: string;
  caller: string;
  window_started_at: Timestamp;
  hits: number;
}

export interface SeedLotsTable extends Written {
  id: Generated<string>;
  variety_id: string;
  label: string;
  source: Generated<string>;
  harvest_year: number | null;
  /** Grams or a count of seeds, as amount_unit says. */
  amount: number | null;
  amount_unit: AmountUnit;
  storage_place: Generated<string>;
  notes: Generated<string>;
}

export interface GerminationTestsTable {
  id: Generated<string>;
  lot_id: string;
  tested_on: DateText;
  seeds_tested: number;
  seeds_germinated: number;
  days: number;
  notes: Generated<string>;
  created_at: Generated<Date>;
  created_by: string | null;
}

export interface SeedOffersTable extends Written {
  id: Generated<string>;
  variety_id: string;
  lot_id: string;
  packets_offered: number;
  packets_left: number;
  note: Generated<string>;
  status: Generated<OfferStatus>;
}

export interface SeedRequestsTable {
  id: Generated<string>;
  offer_id: string;
  requester_id: string;
  ship_to: string;
  message: Generated<string>;
  status: Generated<SeedRequestStatus>;
  answer: Generated<string>;
  answered_at: Timestamp | null;
  answered_by: string | null;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
}

export interface Database {
  users: UsersTable;
  sessions: SessionsTable;
  accounts: AccountsTable;
  verifications: VerificationsTable;
  rate_limits: RateLimitsTable;
  trials: TrialsTable;
  sites: SitesTable;
  entries: EntriesTable;
  plots: PlotsTable;
  traits: TraitsTable;
  harvests: HarvestsTable;
  plot_harvest_totals: PlotHarvestTotalsTable;
  observations: ObservationsTable;
  field_events: FieldEventsTable;
  photos: PhotosTable;
  trial_members: TrialMembersTable;
  trial_member_sites: TrialMemberSitesTable;
  results_sheets: ResultsSheetsTable;
  result_versions: ResultVersionsTable;
  result_followers: ResultFollowersTable;
  follow_requests: FollowRequestsTable;
  sign_in_throttles: SignInThrottlesTable;
  invitations: InvitationsTable;
  invitation_sites: InvitationSitesTable;
  audit_log: AuditLogTable;
  daily_weather: DailyWeatherTable;
  request_rate_windows: RequestRateWindowsTable;
  outgoing_mail: OutgoingMailTable;
  groups: GroupsTable;
  group_members: GroupMembersTable;
  varieties: VarietiesTable;
  seed_lots: SeedLotsTable;
  germination_tests: GerminationTestsTable;
  seed_offers: SeedOffersTable;
  seed_requests: SeedRequestsTable;
}

export type Trial = Selectable<TrialsTable>;
export type NewTrial = Insertable<TrialsTable>;
export type TrialUpdate = Updateable<TrialsTable>;
