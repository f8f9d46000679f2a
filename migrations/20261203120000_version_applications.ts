// The application catalogue becomes the program's own, versioned like rubrics. An
// application is one code across its versions; saving a changed application archives its
// published version and publishes the next, and an exam keeps the version it was recorded
// under (exams.application_id points at that version), so its views' and findings' labels
// never change under it. Each version also carries the orientation convention the reviewer
// judges the marker by, the presets, the cautions shown on exam and feedback pages, and
// for views whether they are required and for views and findings a short hint (a cut-off,
// what confirms the finding).
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("applications", (t) => {
    t.integer("version").notNullable().defaultTo(1);
    t.text("status").notNullable().defaultTo("published");
    t.text("orientation").notNullable().defaultTo("screen_left");
    t.specificType("presets", "text[]").notNullable().defaultTo("{}");
    t.specificType("cautions", "text[]").notNullable().defaultTo("{}");
    t.uuid("created_by").references("users.id").onDelete("SET NULL");
    t.timestamp("published_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("archived_at", { useTz: true });
    t.dropUnique(["program_id", "code"]);
    t.unique(["program_id", "code", "version"]);
  });
  await knex.raw(`ALTER TABLE applications ADD CONSTRAINT applications_status_valid CHECK (status IN ('published','archived'))`);
  await knex.raw(`ALTER TABLE applications ADD CONSTRAINT applications_version_positive CHECK (version > 0)`);
  await knex.raw(`ALTER TABLE applications ADD CONSTRAINT applications_orientation_valid CHECK (orientation IN ('screen_left','cardiology'))`);
  // One published version per application code and program.
  await knex.raw(`CREATE UNIQUE INDEX applications_one_published ON applications (program_id, code) WHERE status = 'published'`);

  await knex.schema.alterTable("application_views", (t) => {
    t.boolean("required").notNullable().defaultTo(true);
    t.text("hint").notNullable().defaultTo("");
  });
  await knex.schema.alterTable("application_findings", (t) => {
    t.text("hint").notNullable().defaultTo("");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("application_findings", (t) => t.dropColumn("hint"));
  await knex.schema.alterTable("application_views", (t) => {
    t.dropColumn("required");
    t.dropColumn("hint");
  });
  await knex.raw(`DROP INDEX applications_one_published`);
  await knex("applications").where("status", "archived").delete();
  await knex.raw(`ALTER TABLE applications DROP CONSTRAINT applications_status_valid`);
  await knex.raw(`ALTER TABLE applications DROP CONSTRAINT applications_version_positive`);
  await knex.raw(`ALTER TABLE applications DROP CONSTRAINT applications_orientation_valid`);
  await knex.schema.alterTable("applications", (t) => {
    t.dropUnique(["program_id", "code", "version"]);
    t.unique(["program_id", "code"]);
    for (const c of ["version", "status", "orientation", "presets", "cautions", "created_by", "published_at", "archived_at"]) t.dropColumn(c);
  });
}
