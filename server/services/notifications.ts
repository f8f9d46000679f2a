// The caller's in-app notifications: listed unread first, marked read.
import type { Db } from "../db/knex";
import type { AuthUser } from "../auth/types";
import { listNotifications, markNotificationsRead } from "../repositories/notifications";
import type { Notifications } from "../../shared/schemas/feedback";

export async function myNotifications(db: Db, user: AuthUser): Promise<Notifications> {
  const rows = await listNotifications(db, user.programId, user.id);
  return {
    items: rows.map((n) => ({ id: n.id, kind: n.kind, examId: n.exam_id, body: n.body, read: n.read_at !== null, createdAt: n.created_at.toISOString() })),
    unread: rows.filter((n) => !n.read_at).length,
  };
}

/** Marks the caller's notifications read: the listed ones, or all when no ids are given. */
export const markRead = (db: Db, user: AuthUser, ids?: string[]) => markNotificationsRead(db, user.id, ids);
