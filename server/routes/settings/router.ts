// /settings: the program's settings (double-read share, blinding, turnaround target, lease,
// credit rule, learning-curve CUSUM), read and changed by a QA lead or an admin.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { programSettingsUpdateSchema, settingsAnswerSchema } from "./schema";
import { actorOf } from "../../services/actor";
import { programSettings, saveSettings } from "../../services/settings";

export function registerSettingsRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/settings",
    summary: "Program settings (double-read share, blinding, turnaround target, lease, credit rule)",
    tag: "oversight",
    access: ["qa_lead", "admin"],
    responses: { 200: { description: "Settings", schema: settingsAnswerSchema } },
    handler: async ({ user }) => ({ settings: await programSettings(db, user.programId) }),
  });

  defineRoute(kit, {
    method: "patch",
    path: "/settings",
    summary: "Change program settings",
    tag: "oversight",
    access: ["qa_lead", "admin"],
    body: programSettingsUpdateSchema,
    responses: { 200: { description: "Settings", schema: settingsAnswerSchema } },
    handler: async ({ req, user, body }) => ({ settings: await saveSettings(db, actorOf(req, user), body) }),
  });
}
