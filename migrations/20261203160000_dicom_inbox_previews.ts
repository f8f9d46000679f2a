// A preview (the middle frame as a JPEG, made from the de-identified object) for each object in
// the DICOM inbox, so a clinician can tell studies apart without opening them. Objects received
// before this have none and show a placeholder.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("dicom_inbox_objects", (t) => t.text("preview_key"));
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("dicom_inbox_objects", (t) => t.dropColumn("preview_key"));
}
