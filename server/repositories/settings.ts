// Program settings: stored as JSON on the program, read through the shared schema so every
// missing key takes its documented default.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import { HttpError } from "../http/errors";
import { programSettingsSchema, type ProgramSettings } from "../../shared/schemas/reviews";

export async function getSettings(db: Db | Knex.Transaction, programId: string): Promise<ProgramSettings> {
  const row = await db("programs").where("id", programId).first("settings");
  return programSettingsSchema.parse(row?.settings ?? {});
}

export async function updateSettings(db: Db | Knex.Transaction, programId: string, changes: Partial<ProgramSettings>): Promise<ProgramSettings> {
  const next = programSettingsSchema.parse({ ...(await getSettings(db, programId)), ...changes });
  if (!(next.cusumUnacceptableRate > next.cusumAcceptableRate))
    throw new HttpError(400, "validation_failed", "cusumUnacceptableRate: must be above the acceptable failure rate", [
      { path: "cusumUnacceptableRate", message: "must be above the acceptable failure rate" },
    ]);
  await db("programs")
    .where("id", programId)
    .update({ settings: JSON.stringify(next) });
  return next;
}
