// An optional encounter or accession reference on an exam, for a callback to find the patient:
// sealed with AES-256-GCM by the server (server/auth/sealed.ts) before it is written, so the
// database and its dumps hold only ciphertext. Only a QA lead can open it, on a follow-up.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("exams", (t) => t.text("encounter_ref_sealed"));
  await knex.raw(`ALTER TABLE exams ADD CONSTRAINT exams_encounter_ref_sealed CHECK (encounter_ref_sealed IS NULL OR encounter_ref_sealed LIKE 'v1:%')`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("ALTER TABLE exams DROP CONSTRAINT exams_encounter_ref_sealed");
  await knex.schema.alterTable("exams", (t) => t.dropColumn("encounter_ref_sealed"));
}
