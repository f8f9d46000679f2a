// Exams a sonographer submits, their findings (the sonographer's own read), and clips with
// their processing state. Storage keys are generated; a user's file name never reaches disk.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("exams", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.uuid("sonographer_id").notNullable().references("users.id");
    t.uuid("application_id").notNullable().references("applications.id");
    // The blinded per-exam code reviewers see instead of the sonographer's name.
    t.text("code").notNullable();
    t.text("status").notNullable().defaultTo("draft");
    t.timestamp("performed_at", { useTz: true }).notNullable();
    t.text("setting").notNullable();
    t.text("transducer").notNullable();
    t.text("preset").notNullable().defaultTo("");
    t.text("indication").notNullable().defaultTo("");
    t.timestamp("attested_at", { useTz: true });
    t.timestamp("submitted_at", { useTz: true });
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(["program_id", "code"]);
    t.index(["program_id", "sonographer_id", "status"]);
    t.index(["program_id", "performed_at"]);
  });
  await knex.raw(`ALTER TABLE exams ADD CONSTRAINT exams_status_valid CHECK (status IN ('draft','submitted'))`);
  await knex.raw(`ALTER TABLE exams ADD CONSTRAINT exams_setting_valid CHECK (setting IN ('clinical','educational','simulated'))`);
  await knex.raw(`ALTER TABLE exams ADD CONSTRAINT exams_transducer_valid CHECK (transducer IN ('linear','curvilinear','phased','endocavitary'))`);
  await knex.raw(`ALTER TABLE exams ADD CONSTRAINT exams_submitted_consistent CHECK (
    (status = 'draft' AND submitted_at IS NULL) OR (status <> 'draft' AND submitted_at IS NOT NULL AND attested_at IS NOT NULL))`);

  await knex.schema.createTable("exam_findings", (t) => {
    t.uuid("exam_id").notNullable().references("exams.id").onDelete("CASCADE");
    t.text("finding_key").notNullable();
    t.text("read").notNullable();
    t.primary(["exam_id", "finding_key"]);
  });
  await knex.raw(`ALTER TABLE exam_findings ADD CONSTRAINT exam_findings_read_valid CHECK (read IN ('positive','negative','indeterminate'))`);

  await knex.schema.createTable("clips", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("exam_id").notNullable().references("exams.id").onDelete("CASCADE");
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.text("view_key");
    t.text("kind").notNullable();
    t.text("state").notNullable().defaultTo("queued");
    t.text("error");
    t.integer("attempts").notNullable().defaultTo(0);
    // Each (re)processing request bumps process_version; a job carries the version it was
    // sent for, so a stale or duplicate job does nothing (jobs are idempotent).
    t.integer("process_version").notNullable().defaultTo(1);
    t.integer("processed_version");
    // Shown to the owner only, cleaned; never used as a path.
    t.text("original_name").notNullable().defaultTo("");
    t.text("original_key");
    t.text("sha256").notNullable();
    t.bigInteger("size_bytes").notNullable();
    t.text("mime").notNullable();
    t.jsonb("probe");
    t.jsonb("plan");
    t.text("output_key");
    t.text("poster_key");
    t.text("strip_key");
    t.text("thumb_key");
    t.integer("width");
    t.integer("height");
    t.double("seconds");
    t.double("fps");
    t.integer("frames");
    t.jsonb("redactions").notNullable().defaultTo("[]");
    t.jsonb("precheck");
    t.integer("position").notNullable().defaultTo(0);
    t.timestamp("processed_at", { useTz: true });
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(["exam_id", "sha256"]);
    t.index(["state", "updated_at"]);
  });
  await knex.raw(`ALTER TABLE clips ADD CONSTRAINT clips_kind_valid CHECK (kind IN ('video','still'))`);
  await knex.raw(`ALTER TABLE clips ADD CONSTRAINT clips_state_valid CHECK (state IN ('queued','processing','ready','failed'))`);
  await knex.raw(`ALTER TABLE clips ADD CONSTRAINT clips_sha256_hex CHECK (sha256 ~ '^[0-9a-f]{64}$')`);
  await knex.raw(`ALTER TABLE clips ADD CONSTRAINT clips_size_positive CHECK (size_bytes > 0)`);
  await knex.raw(`ALTER TABLE clips ADD CONSTRAINT clips_ready_has_output CHECK (state <> 'ready' OR (output_key IS NOT NULL AND poster_key IS NOT NULL))`);
  await knex.raw(`ALTER TABLE clips ADD CONSTRAINT clips_failed_has_error CHECK (state <> 'failed' OR error IS NOT NULL)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("clips");
  await knex.schema.dropTable("exam_findings");
  await knex.schema.dropTable("exams");
}
