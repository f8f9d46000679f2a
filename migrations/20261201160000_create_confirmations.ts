// Confirmatory results: what CT, a formal echo, surgery or clinical follow-up later showed
// for a finding of an exam, entered by the sonographer or the QA lead. Accuracy against
// them is reported apart from accuracy against the reviewer.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("confirmations", (t) => {
    t.uuid("exam_id").notNullable().references("exams.id").onDelete("CASCADE");
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.text("finding_key").notNullable();
    t.text("method").notNullable();
    t.text("result");
    t.text("note").notNullable().defaultTo("");
    t.uuid("entered_by").references("users.id").onDelete("SET NULL");
    t.timestamp("entered_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(["exam_id", "finding_key"]);
    t.index(["program_id"]);
  });
  await knex.raw(`ALTER TABLE confirmations ADD CONSTRAINT confirmations_method_valid CHECK (method IN ('ct','formal_echo','surgery','follow_up','none'))`);
  await knex.raw(
    `ALTER TABLE confirmations ADD CONSTRAINT confirmations_result_valid CHECK ((method = 'none' AND result IS NULL) OR (method <> 'none' AND result IN ('positive','negative')))`,
  );
  // Progress reads a sonographer's exams by date.
  await knex.raw(`CREATE INDEX IF NOT EXISTS exams_sonographer_performed ON exams (program_id, sonographer_id, performed_at)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`DROP INDEX IF EXISTS exams_sonographer_performed`);
  await knex.schema.dropTable("confirmations");
}
