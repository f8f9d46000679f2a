// Versioned rubrics. A rubric "family" is one rubric across its versions; editing a
// published version creates the next version, and every review keeps the version it used.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("rubrics", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.uuid("family_id").notNullable();
    t.integer("version").notNullable();
    t.text("name").notNullable();
    t.text("status").notNullable().defaultTo("draft");
    t.uuid("created_by").references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("published_at", { useTz: true });
    t.timestamp("archived_at", { useTz: true });
    t.unique(["family_id", "version"]);
    t.index(["program_id", "status"]);
  });
  await knex.raw(`ALTER TABLE rubrics ADD CONSTRAINT rubrics_status_valid CHECK (status IN ('draft','published','archived'))`);
  await knex.raw(`ALTER TABLE rubrics ADD CONSTRAINT rubrics_version_positive CHECK (version > 0)`);
  // One draft per family at a time, and at most one published version per family.
  await knex.raw(`CREATE UNIQUE INDEX rubrics_one_draft ON rubrics (family_id) WHERE status = 'draft'`);
  await knex.raw(`CREATE UNIQUE INDEX rubrics_one_published ON rubrics (family_id) WHERE status = 'published'`);

  await knex.schema.createTable("rubric_criteria", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("rubric_id").notNullable().references("rubrics.id").onDelete("CASCADE");
    t.text("key").notNullable();
    t.text("label").notNullable();
    t.text("help").notNullable().defaultTo("");
    t.text("kind").notNullable();
    // Levels for ordinal, choice and yes/no criteria: [{ value, label, anchor, fails }].
    t.jsonb("levels").notNullable().defaultTo("[]");
    t.double("min_value");
    t.double("max_value");
    t.boolean("required").notNullable().defaultTo(true);
    t.boolean("critical").notNullable().defaultTo(false);
    t.double("tolerance").notNullable().defaultTo(0);
    // Application codes this criterion applies to; empty means all.
    t.specificType("applications", "text[]").notNullable().defaultTo("{}");
    t.integer("position").notNullable();
    t.unique(["rubric_id", "key"]);
  });
  await knex.raw(`ALTER TABLE rubric_criteria ADD CONSTRAINT rubric_criteria_kind_valid CHECK (kind IN ('ordinal','choice','yes_no','number'))`);
  await knex.raw(`ALTER TABLE rubric_criteria ADD CONSTRAINT rubric_criteria_key_format CHECK (key ~ '^[a-z][a-z0-9_]*$')`);
  await knex.raw(`ALTER TABLE rubric_criteria ADD CONSTRAINT rubric_criteria_tolerance_nonneg CHECK (tolerance >= 0)`);
  await knex.raw(`ALTER TABLE rubric_criteria ADD CONSTRAINT rubric_criteria_levels_present CHECK (kind = 'number' OR jsonb_array_length(levels) >= 2)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("rubric_criteria");
  await knex.schema.dropTable("rubrics");
}
