// The DICOM inbox: each program has its own called AE title; objects sent by ultrasound
// machines land de-identified in the program's inbox, grouped by study (a study is known by a
// keyed hash of its original Study Instance UID, never the UID itself), with the person the
// operator name matched (the names are kept per membership, never the object's own value).
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("programs", (t) => {
    t.text("dicom_ae_title").unique();
    t.text("dicom_secret");
  });
  await knex.raw(`ALTER TABLE programs ADD CONSTRAINT programs_dicom_ae_title_valid CHECK (dicom_ae_title ~ '^[A-Z0-9_]{1,16}$')`);
  await knex("programs").where("slug", "cedar-hollow-em").update({ dicom_ae_title: "CEDARHOLLOW" });
  await knex("programs").where("slug", "tamsin-ridge-cc").update({ dicom_ae_title: "TAMSINRIDGE" });
  await knex.schema.alterTable("memberships", (t) => {
    t.specificType("dicom_operator_names", "text[]").notNullable().defaultTo("{}");
  });
  await knex.schema.createTable("dicom_inbox_studies", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.text("study_hash").notNullable();
    t.text("uid_secret").notNullable();
    t.text("calling_ae").notNullable();
    t.uuid("matched_user_id").references("users.id").onDelete("SET NULL");
    t.uuid("claimed_by").references("users.id").onDelete("SET NULL");
    t.uuid("exam_id").references("exams.id").onDelete("SET NULL");
    t.timestamp("first_received_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("last_received_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(["program_id", "study_hash"]);
  });
  await knex.schema.createTable("dicom_inbox_objects", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("study_id").notNullable().references("dicom_inbox_studies.id").onDelete("CASCADE");
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.text("storage_key").notNullable();
    t.text("sha256").notNullable();
    t.bigInteger("size_bytes").notNullable();
    t.jsonb("facts").notNullable();
    t.timestamp("received_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(["study_id", "sha256"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("dicom_inbox_objects");
  await knex.schema.dropTable("dicom_inbox_studies");
  await knex.schema.alterTable("memberships", (t) => t.dropColumn("dicom_operator_names"));
  await knex.raw("ALTER TABLE programs DROP CONSTRAINT programs_dicom_ae_title_valid");
  await knex.schema.alterTable("programs", (t) => {
    t.dropColumn("dicom_secret");
    t.dropColumn("dicom_ae_title");
  });
}
