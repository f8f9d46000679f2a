// Tenancy and people: a program is a tenant; a user may belong to several programs,
// each membership carrying its own roles.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("programs", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("name").notNullable();
    t.text("slug").notNullable().unique();
    t.jsonb("settings").notNullable().defaultTo("{}");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`ALTER TABLE programs ADD CONSTRAINT programs_name_not_blank CHECK (length(trim(name)) > 0)`);
  await knex.raw(`ALTER TABLE programs ADD CONSTRAINT programs_slug_format CHECK (slug ~ '^[a-z0-9][a-z0-9-]*$')`);

  await knex.schema.createTable("users", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("email").notNullable().unique();
    t.text("name").notNullable();
    // Null until the invited person sets a password.
    t.text("password_hash");
    t.timestamp("password_changed_at", { useTz: true });
    t.timestamp("last_sign_in_at", { useTz: true });
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`ALTER TABLE users ADD CONSTRAINT users_email_lower CHECK (email = lower(email) AND position('@' in email) > 1)`);

  await knex.schema.createTable("memberships", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.specificType("roles", "text[]").notNullable();
    t.timestamp("deactivated_at", { useTz: true });
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(["user_id", "program_id"]);
    t.index(["program_id"]);
  });
  await knex.raw(`ALTER TABLE memberships ADD CONSTRAINT memberships_roles_valid CHECK (
    cardinality(roles) > 0 AND roles <@ ARRAY['sonographer','reviewer','qa_lead','admin']::text[])`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("memberships");
  await knex.schema.dropTable("users");
  await knex.schema.dropTable("programs");
}
