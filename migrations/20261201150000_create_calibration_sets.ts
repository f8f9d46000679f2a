// Calibration sets: exams a QA lead picks (optionally with a reference answer) and sends to
// several reviewers as blinded calibration reads, to see how consistently they score.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("calibration_sets", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.text("name").notNullable();
    t.uuid("created_by").references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["program_id"]);
  });
  await knex.schema.createTable("calibration_items", (t) => {
    t.uuid("set_id").notNullable().references("calibration_sets.id").onDelete("CASCADE");
    t.uuid("exam_id").notNullable().references("exams.id").onDelete("CASCADE");
    // The reference answer { scores, reads }, when the QA lead gives one.
    t.jsonb("reference");
    t.integer("position").notNullable();
    t.primary(["set_id", "exam_id"]);
  });
  await knex.schema.alterTable("assignments", (t) => {
    t.uuid("calibration_set_id").references("calibration_sets.id").onDelete("CASCADE");
  });
  await knex.raw(`ALTER TABLE assignments DROP CONSTRAINT assignments_kind_valid`);
  await knex.raw(`ALTER TABLE assignments ADD CONSTRAINT assignments_kind_valid CHECK (kind IN ('primary','second','adjudication','calibration'))`);
  await knex.raw(`ALTER TABLE assignments ADD CONSTRAINT assignments_calibration_has_set CHECK ((kind = 'calibration') = (calibration_set_id IS NOT NULL))`);
  // Calibration reads may repeat an exam a reviewer already read; the other rules stay.
  await knex.raw(`DROP INDEX assignments_one_per_reviewer`);
  await knex.raw(
    `CREATE UNIQUE INDEX assignments_one_per_reviewer ON assignments (exam_id, reviewer_id) WHERE reviewer_id IS NOT NULL AND state <> 'cancelled' AND kind <> 'calibration'`,
  );
  await knex.raw(`DROP INDEX assignments_one_of_each_kind`);
  await knex.raw(`CREATE UNIQUE INDEX assignments_one_of_each_kind ON assignments (exam_id, kind) WHERE state <> 'cancelled' AND kind <> 'calibration'`);
  await knex.raw(`CREATE UNIQUE INDEX assignments_one_calibration_read ON assignments (calibration_set_id, exam_id, assigned_to) WHERE kind = 'calibration'`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`DELETE FROM assignments WHERE kind = 'calibration'`);
  await knex.raw(`DROP INDEX assignments_one_calibration_read`);
  await knex.schema.alterTable("assignments", (t) => t.dropColumn("calibration_set_id"));
  await knex.schema.dropTable("calibration_items");
  await knex.schema.dropTable("calibration_sets");
}
