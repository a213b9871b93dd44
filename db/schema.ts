/**
 * The typed shape of the migrated database. A test compares every table and column here with
 * the real migrated schema, so this file cannot drift from db/migrations.
 */
import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';
// Enumerations come from the one list each in common/contracts (the database's checks match them).
import type { letterMethods } from '../common/contracts/analysis';
import type {
  fertilizerPolicies,
  irrigationMethods as siteIrrigationMethods,
} from '../common/contracts/design';
import type { mailStatuses } from '../common/contracts/invitations';
import type { unitSystems } from '../common/contracts/me';
import type { photoSubjects } from '../common/contracts/photos';
import type {
  auditActions,
  auditTables,
  fieldEventKinds,
  harvestGrades,
} from '../common/contracts/records';
import type {
  entryTypes,
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
  fertilizer_policy: Generated<FertilizerPolicy>;
  fertilizer_notes: Generated<string>;
  /** The trial this one was copied from for a new season. */
  copied_from_trial_id: Generated<string | null>;
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
}

export interface PlotsTable extends Written {
  id: Generated<string>;
  trial_id: string;
  site_id: string;
  entry_id: string;
  block: number;
  position: number;
  plot_number: number;
  plants_set: number | null;
  plants_surviving: number | null;
  in_row_spacing_mm: number | null;
  row_length_mm: number | null;
  row_spacing_mm: number | null;
  gaps: number | null;
  planted_note: Generated<string>;
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
  last_sent_at: Timestamp | null;
  send_attempts: Generated<number>;
  mail_status: Generated<(typeof mailStatuses)[number]>;
  last_send_error: string | null;
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

/** Request counts per caller and fixed window, for rate limits (server/lib/rate-limit.ts). */
export interface RequestRateWindowsTable {
  bucket: string;
  caller: string;
  window_started_at: Timestamp;
  hits: number;
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
}

export type Trial = Selectable<TrialsTable>;
export type NewTrial = Insertable<TrialsTable>;
export type TrialUpdate = Updateable<TrialsTable>;

/**
 * Every column of every table, listed once. The mapped type makes the compiler refuse a
 * missing or extra column, and the schema test compares this list with the migrated database.
 */
export const databaseColumns: { [T in keyof Database]: { [C in keyof Database[T]]-?: true } } = {
  users: {
    id: true,
    name: true,
    email: true,
    email_verified: true,
    image: true,
    created_at: true,
    updated_at: true,
    unit_system: true,
    is_admin: true,
  },
  sessions: {
    id: true,
    expires_at: true,
    token: true,
    created_at: true,
    updated_at: true,
    ip_address: true,
    user_agent: true,
    user_id: true,
  },
  accounts: {
    id: true,
    account_id: true,
    provider_id: true,
    user_id: true,
    access_token: true,
    refresh_token: true,
    id_token: true,
    access_token_expires_at: true,
    refresh_token_expires_at: true,
    scope: true,
    password: true,
    created_at: true,
    updated_at: true,
  },
  verifications: {
    id: true,
    identifier: true,
    value: true,
    expires_at: true,
    created_at: true,
    updated_at: true,
  },
  rate_limits: { id: true, key: true, count: true, last_request: true },
  trials: {
    id: true,
    slug: true,
    title: true,
    crop: true,
    season: true,
    design: true,
    status: true,
    description: true,
    sowing_date: true,
    transplant_date: true,
    layout_seed: true,
    replicates: true,
    rows_per_plot: true,
    row_length_mm: true,
    row_spacing_mm: true,
    in_row_spacing_mm: true,
    layout_generated_at: true,
    fertilizer_policy: true,
    fertilizer_notes: true,
    copied_from_trial_id: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  sites: {
    id: true,
    trial_id: true,
    name: true,
    region: true,
    soil_texture: true,
    irrigation_method: true,
    notes: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  entries: {
    id: true,
    trial_id: true,
    name: true,
    code: true,
    seed_source: true,
    seed_lot: true,
    entry_type: true,
    days_to_maturity_claimed: true,
    notes: true,
    in_row_spacing_mm: true,
    no_fertilizer: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  plots: {
    id: true,
    trial_id: true,
    site_id: true,
    entry_id: true,
    block: true,
    position: true,
    plot_number: true,
    plants_set: true,
    plants_surviving: true,
    in_row_spacing_mm: true,
    row_length_mm: true,
    row_spacing_mm: true,
    gaps: true,
    planted_note: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  traits: {
    id: true,
    trial_id: true,
    key: true,
    label: true,
    quantity_kind: true,
    basis: true,
    direction: true,
    scale_min: true,
    scale_max: true,
    sort_order: true,
    display_unit: true,
    plausible_min: true,
    plausible_max: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  harvests: {
    id: true,
    trial_id: true,
    plot_id: true,
    harvested_on: true,
    fruit_count: true,
    mass_g: true,
    grade: true,
    note: true,
    version: true,
    deleted_at: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  observations: {
    id: true,
    trial_id: true,
    plot_id: true,
    trait_id: true,
    observed_on: true,
    value: true,
    value_date: true,
    plant_number: true,
    note: true,
    version: true,
    deleted_at: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  field_events: {
    id: true,
    trial_id: true,
    site_id: true,
    plot_id: true,
    kind: true,
    occurred_on: true,
    irrigation_method: true,
    run_time_min: true,
    water_depth_mm: true,
    rain_mm: true,
    amendment_kind: true,
    rate_g_per_m2: true,
    none_applied: true,
    target_spacing_mm: true,
    note: true,
    drip_emitter_flow_l_per_h: true,
    drip_emitter_spacing_mm: true,
    drip_line_flow_l_per_h_per_m: true,
    wetted_width_mm: true,
    sprinkler_rate_mm_per_h: true,
    hand_volume_l: true,
    wetted_area_m2: true,
    version: true,
    deleted_at: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  photos: {
    id: true,
    trial_id: true,
    entry_id: true,
    plot_id: true,
    taken_on: true,
    caption: true,
    subject: true,
    storage_key: true,
    width: true,
    height: true,
    bytes: true,
    deleted_at: true,
    mime_type: true,
    original_ext: true,
    sha256: true,
    display_width: true,
    display_height: true,
    display_bytes: true,
    thumb_width: true,
    thumb_height: true,
    thumb_bytes: true,
    captured_at: true,
    is_cover: true,
    purge_after: true,
    purged_at: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  trial_members: {
    trial_id: true,
    user_id: true,
    role: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  trial_member_sites: {
    trial_id: true,
    user_id: true,
    site_id: true,
    created_at: true,
    created_by: true,
  },
  invitations: {
    id: true,
    trial_id: true,
    email: true,
    role: true,
    token_hash: true,
    invited_by: true,
    expires_at: true,
    accepted_at: true,
    accepted_by: true,
    revoked_at: true,
    revoked_by: true,
    last_sent_at: true,
    send_attempts: true,
    mail_status: true,
    last_send_error: true,
    created_at: true,
    updated_at: true,
  },
  invitation_sites: { invitation_id: true, trial_id: true, site_id: true },
  audit_log: {
    id: true,
    trial_id: true,
    table_name: true,
    record_id: true,
    action: true,
    before: true,
    after: true,
    actor_id: true,
    at: true,
  },
  daily_weather: {
    id: true,
    trial_id: true,
    site_id: true,
    observed_on: true,
    tmin_c: true,
    tmax_c: true,
    rain_mm: true,
    source: true,
    note: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  results_sheets: {
    trial_id: true,
    summary: true,
    methods: true,
    traits: true,
    entry_notes: true,
    cover_photos: true,
    alpha: true,
    letters: true,
    license: true,
    created_at: true,
    updated_at: true,
    created_by: true,
    updated_by: true,
  },
  result_versions: {
    id: true,
    trial_id: true,
    version: true,
    change_note: true,
    snapshot: true,
    published_at: true,
    published_by: true,
  },
  result_followers: {
    id: true,
    trial_id: true,
    email: true,
    confirm_token_hash: true,
    unsubscribe_token: true,
    confirmed_at: true,
    unsubscribed_at: true,
    created_at: true,
    updated_at: true,
  },
  follow_requests: {
    id: true,
    trial_id: true,
    email: true,
    client_ip: true,
    mailed: true,
    requested_at: true,
  },
  sign_in_throttles: { email: true, failures: true, last_failure_at: true, blocked_until: true },
  request_rate_windows: {
    bucket: true,
    caller: true,
    window_started_at: true,
    hits: true,
  },
};
