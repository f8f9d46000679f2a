// Each program's application catalogue (exam types) with their standard views and the
// findings a sonographer reads as positive / negative / indeterminate.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("applications", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.text("code").notNullable();
    t.text("name").notNullable();
    t.specificType("usual_transducers", "text[]").notNullable();
    t.decimal("depth_min_cm", 4, 1).notNullable();
    t.decimal("depth_max_cm", 4, 1).notNullable();
    t.boolean("active").notNullable().defaultTo(true);
    t.integer("position").notNullable().defaultTo(0);
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(["program_id", "code"]);
  });
  await knex.raw(`ALTER TABLE applications ADD CONSTRAINT applications_code_format CHECK (code ~ '^[a-z][a-z0-9_]*$')`);
  await knex.raw(`ALTER TABLE applications ADD CONSTRAINT applications_transducers_valid CHECK (
    usual_transducers <@ ARRAY['linear','curvilinear','phased','endocavitary']::text[])`);
  await knex.raw(`ALTER TABLE applications ADD CONSTRAINT applications_depth_range CHECK (
    depth_min_cm > 0 AND depth_max_cm >= depth_min_cm AND depth_max_cm <= 40)`);

  for (const table of ["application_views", "application_findings"]) {
    await knex.schema.createTable(table, (t) => {
      t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
      t.uuid("application_id").notNullable().references("applications.id").onDelete("CASCADE");
      t.text("key").notNullable();
      t.text("label").notNullable();
      t.integer("position").notNullable().defaultTo(0);
      t.unique(["application_id", "key"]);
    });
    await knex.raw(`ALTER TABLE ${table} ADD CONSTRAINT ${table}_key_format CHECK (key ~ '^[a-z0-9][a-z0-9_]*$')`);
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("application_findings");
  await knex.schema.dropTable("application_views");
  await knex.schema.dropTable("applications");
}
