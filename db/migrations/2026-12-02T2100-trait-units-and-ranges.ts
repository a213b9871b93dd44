import { type Kysely, sql } from 'kysely';

// Frozen. A trait's own display unit (null: chosen from its kind), the range of values that
// are plausible for it (a value outside is asked about, never refused), and trait edits in the
// audit log. Ranges for traits that already exist are filled from the usual presets: per fruit
// for a harvest mass, per harvest for a harvest count (common practice, no source).
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table traits
      add column display_unit text,
      add column plausible_min finite_float,
      add column plausible_max finite_float,
      add constraint traits_display_unit_fits_kind check (
        display_unit is null
        or (quantity_kind = 'length' and display_unit in ('mm', 'cm', 'm'))
        or (quantity_kind = 'mass' and display_unit in ('g', 'kg'))
      ),
      add constraint traits_plausible_range_order check (
        plausible_min is null or plausible_max is null or plausible_min < plausible_max
      );

    update traits set plausible_min = 0.5, plausible_max = 5000
      where quantity_kind = 'mass' and basis = 'harvest';
    update traits set plausible_min = 0, plausible_max = 1000
      where quantity_kind = 'count' and basis = 'harvest';
    update traits set plausible_min = 20, plausible_max = 4000
      where key = 'plant_height' and quantity_kind = 'length';
    update traits set plausible_min = 20, plausible_max = 600
      where key = 'pod_length_at_toughness' and quantity_kind = 'length';

    alter table audit_log drop constraint audit_log_table_name_check;
    alter table audit_log add constraint audit_log_table_name_check
      check (table_name in ('harvests', 'observations', 'field_events', 'plots', 'traits'));
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    delete from audit_log where table_name = 'traits';
    alter table audit_log drop constraint audit_log_table_name_check;
    alter table audit_log add constraint audit_log_table_name_check
      check (table_name in ('harvests', 'observations', 'field_events', 'plots'));
    alter table traits
      drop constraint traits_plausible_range_order,
      drop constraint traits_display_unit_fits_kind,
      drop column plausible_max,
      drop column plausible_min,
      drop column display_unit;
  `.execute(db);
}
