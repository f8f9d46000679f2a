// Credit rules per application, a privileging committee can sign: each application version
// carries its own threshold (none: the program's), a cap on the educational and simulated
// exams that count toward it, a minimum of credited exams with a positive finding, and
// whether credit needs every required view. A read can be marked technically limited by
// patient factors (no credit, and not a failure of technique). The final result keeps the
// reasons it earned no credit, as decided.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("applications", (t) => {
    t.integer("credit_threshold");
    t.integer("credit_non_clinical_cap");
    t.integer("credit_min_positive").notNullable().defaultTo(0);
    t.boolean("credit_require_complete").notNullable().defaultTo(false);
  });
  await knex.raw(`ALTER TABLE applications ADD CONSTRAINT applications_credit_rule_valid CHECK (
    (credit_threshold IS NULL OR credit_threshold BETWEEN 1 AND 1000)
    AND (credit_non_clinical_cap IS NULL OR credit_non_clinical_cap >= 0)
    AND credit_min_positive >= 0)`);
  await knex.schema.alterTable("reviews", (t) => {
    t.boolean("limited").notNullable().defaultTo(false);
  });
  await knex.schema.alterTable("exam_results", (t) => {
    t.boolean("limited").notNullable().defaultTo(false);
    t.specificType("credit_reasons", "text[]").notNullable().defaultTo("{}");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("exam_results", (t) => {
    t.dropColumn("limited");
    t.dropColumn("credit_reasons");
  });
  await knex.schema.alterTable("reviews", (t) => t.dropColumn("limited"));
  await knex.raw(`ALTER TABLE applications DROP CONSTRAINT applications_credit_rule_valid`);
  await knex.schema.alterTable("applications", (t) => {
    for (const c of ["credit_threshold", "credit_non_clinical_cap", "credit_min_positive", "credit_require_complete"]) t.dropColumn(c);
  });
}
