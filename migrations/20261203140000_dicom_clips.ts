// DICOM clips: the facts read from the object before de-identification removed anything
// (depth, frequency, transducer type, frame rate and count, SOP class, transfer syntax), the
// key of the de-identified object kept beside the web clip, and a secret per exam from which
// replacement UIDs are derived, so the instances of one exam keep belonging together.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("clips", (t) => {
    t.jsonb("dicom");
    t.text("dicom_key");
  });
  await knex.schema.alterTable("exams", (t) => {
    t.text("dicom_uid_secret");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("exams", (t) => t.dropColumn("dicom_uid_secret"));
  await knex.schema.alterTable("clips", (t) => {
    t.dropColumn("dicom_key");
    t.dropColumn("dicom");
  });
}
