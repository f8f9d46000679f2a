// Home: "what needs me now", per role the caller holds. Only real counts: a card appears
// once the thing it counts exists in the product.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../app";
import { homeSchema, type Home } from "../../../shared/schemas/home";

export function registerHomeRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/home",
    summary: "Counts of what waits for the caller, per role",
    tag: "home",
    access: "signed_in",
    responses: { 200: { description: "Home sections", schema: homeSchema } },
    handler: async ({ user }): Promise<Home> => {
      const pid = user.programId;
      const countRole = (role: string) =>
        db("memberships")
          .where("program_id", pid)
          .whereNull("deactivated_at")
          .whereRaw("? = ANY(roles)", [role])
          .count<{ c: string }[]>("* as c")
          .then(([r]) => Number(r.c));
      const sections: Home["sections"] = [];
      if (user.roles.includes("sonographer")) {
        const mine = db("exams").where({ program_id: pid, sonographer_id: user.id });
        const [[drafts], [failed], [submitted]] = await Promise.all([
          mine.clone().where("status", "draft").count<{ c: string }[]>("* as c"),
          db("clips as c")
            .join("exams as e", "e.id", "c.exam_id")
            .where({ "e.program_id": pid, "e.sonographer_id": user.id, "e.status": "draft", "c.state": "failed" })
            .count<{ c: string }[]>("* as c"),
          mine.clone().where("status", "submitted").count<{ c: string }[]>("* as c"),
        ]);
        sections.push({
          role: "sonographer",
          title: "Your scanning",
          cards: [
            { key: "drafts", label: "Drafts not yet submitted", count: Number(drafts.c), href: "/exams?status=draft", hint: null },
            {
              key: "failed_clips",
              label: "Clips that failed processing",
              count: Number(failed.c),
              href: "/exams?status=draft",
              hint: Number(failed.c) ? "Retry or remove them before submitting" : null,
            },
            { key: "submitted", label: "Submitted, waiting for review", count: Number(submitted.c), href: "/exams?status=submitted", hint: null },
          ],
        });
      }
      if (user.roles.includes("reviewer")) {
        sections.push({ role: "reviewer", title: "Your reviews", cards: [] });
      }
      if (user.roles.includes("qa_lead")) {
        const [reviewers, sonographers] = await Promise.all([countRole("reviewer"), countRole("sonographer")]);
        sections.push({
          role: "qa_lead",
          title: "Your program",
          cards: [
            { key: "reviewers", label: "Active reviewers", count: reviewers, href: "/setup/people", hint: null },
            { key: "sonographers", label: "Active sonographers", count: sonographers, href: "/setup/people", hint: null },
          ],
        });
      }
      if (user.roles.includes("admin")) {
        const [[open], [inactive], [active]] = await Promise.all([
          db("invitations")
            .where("program_id", pid)
            .whereNull("accepted_at")
            .whereNull("revoked_at")
            .andWhere("expires_at", ">", db.fn.now())
            .count<{ c: string }[]>("* as c"),
          db("memberships").where("program_id", pid).whereNotNull("deactivated_at").count<{ c: string }[]>("* as c"),
          db("memberships").where("program_id", pid).whereNull("deactivated_at").count<{ c: string }[]>("* as c"),
        ]);
        sections.push({
          role: "admin",
          title: "Administration",
          cards: [
            { key: "open_invitations", label: "Invitations waiting for an answer", count: Number(open.c), href: "/setup/people", hint: null },
            { key: "active_members", label: "Active members", count: Number(active.c), href: "/setup/people", hint: null },
            { key: "deactivated_members", label: "Deactivated members", count: Number(inactive.c), href: "/setup/people", hint: null },
          ],
        });
      }
      return { programName: user.programName, sections };
    },
  });
}
