// The program's application catalogue, as every signed-in member reads it.
import type { Db } from "../db/knex";
import { listApplications } from "../repositories/applications";

export const programApplications = (db: Db, programId: string) => listApplications(db, programId);
