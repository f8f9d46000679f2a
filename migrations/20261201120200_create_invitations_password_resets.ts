// One-time tokens sent by e-mail. Only a SHA-256 of each token is stored; every token
// expires and is single use.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("invitations", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.text("email").notNullable();
    t.text("name");
    t.specificType("roles", "text[]").notNullable();
    t.text("token_hash").notNullable().unique();
    t.uuid("invited_by").references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("accepted_at", { useTz: true });
    t.timestamp("revoked_at", { useTz: true });
    t.index(["program_id"]);
  });
  await knex.raw(`ALTER TABLE invitations ADD CONSTRAINT invitations_roles_valid CHECK (
    cardinality(roles) > 0 AND roles <@ ARRAY['sonographer','reviewer','qa_lead','admin']::text[])`);
  await knex.raw(`ALTER TABLE invitations ADD CONSTRAINT invitations_email_lower CHECK (email = lower(email))`);
  await knex.raw(`ALTER TABLE invitations ADD CONSTRAINT invitations_token_hash_hex CHECK (token_hash ~ '^[0-9a-f]{64}$')`);
  // At most one open invitation per address and program.
  await knex.raw(`CREATE UNIQUE INDEX invitations_one_open ON invitations (program_id, email)
    WHERE accepted_at IS NULL AND revoked_at IS NULL`);

  await knex.schema.createTable("password_resets", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("token_hash").notNullable().unique();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("used_at", { useTz: true });
    t.index(["user_id"]);
  });
  await knex.raw(`ALTER TABLE password_resets ADD CONSTRAINT password_resets_token_hash_hex CHECK (token_hash ~ '^[0-9a-f]{64}$')`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("password_resets");
  await knex.schema.dropTable("invitations");
}
