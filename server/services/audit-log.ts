// Setup → Audit log: one page of the program's events, newest first, and how many there are.
import type { Db } from "../db/knex";
import { listAuditEntries } from "../repositories/audit";

export const readAuditLog = (db: Db, programId: string, page: { limit: number; offset: number; action?: string }) => listAuditEntries(db, programId, page);
