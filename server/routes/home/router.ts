// Home: "what needs me now", per role the caller holds. Only real counts: a card appears
// once the thing it counts exists in the product.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { homeSchema, type Home } from "../../../shared/schemas/home";
import { claimable } from "../../repositories/assignments";
import { reviewerReads } from "../../policies/exam";

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
        const [[waiting], [held], [handed], [questions]] = await Promise.all([
          claimable(db, pid, user.id).count<{ c: string }[]>("* as c"),
          db("assignments")
            .where({ program_id: pid, reviewer_id: user.id, state: "claimed" })
            .andWhere("lease_expires_at", ">", db.fn.now())
            .count<{ c: string }[]>("* as c"),
          db("assignments")
            .where({ program_id: pid, kind: "adjudication", assigned_to: user.id })
            .whereIn("state", ["open", "claimed"])
            .count<{ c: string }[]>("* as c"),
          // Exams I reviewed whose thread ends with a question from the sonographer.
          db("exams as e")
            .where("e.program_id", pid)
            .whereExists(reviewerReads(db, user.id, "thread", db.ref("e.id")))
            .whereRaw(
              `(SELECT m.author_id = e.sonographer_id FROM feedback_messages m WHERE m.exam_id = e.id ORDER BY m.created_at DESC, m.id DESC LIMIT 1) IS TRUE`,
            )
            .count<{ c: string }[]>("* as c"),
        ]);
        sections.push({
          role: "reviewer",
          title: "Your reviews",
          cards: [
            { key: "queue_waiting", label: "Exams waiting for a read", count: Number(waiting.c), href: "/queue", hint: null },
            {
              key: "claims_held",
              label: "Exams you hold",
              count: Number(held.c),
              href: "/queue",
              hint: Number(held.c) ? "Finish or release them before the claim runs out" : null,
            },
            ...(Number(handed.c)
              ? [{ key: "adjudications_handed", label: "Adjudications handed to you", count: Number(handed.c), href: "/oversight/adjudication", hint: null }]
              : []),
            ...(Number(questions.c)
              ? [
                  {
                    key: "questions_waiting",
                    label: "Questions from sonographers awaiting your answer",
                    count: Number(questions.c),
                    href: "/reviews/questions",
                    hint: null,
                  },
                ]
              : []),
          ],
        });
      }
      if (user.roles.includes("qa_lead")) {
        const [reviewers, sonographers, [adjudications], [followUps], [backlog]] = await Promise.all([
          countRole("reviewer"),
          countRole("sonographer"),
          db("assignments").where({ program_id: pid, kind: "adjudication" }).whereIn("state", ["open", "claimed"]).count<{ c: string }[]>("* as c"),
          db("follow_ups").where("program_id", pid).whereNot("status", "closed").count<{ c: string }[]>("* as c"),
          db("exams").where("program_id", pid).whereIn("status", ["submitted", "in_review", "adjudication"]).count<{ c: string }[]>("* as c"),
        ]);
        sections.push({
          role: "qa_lead",
          title: "Your program",
          cards: [
            { key: "adjudications", label: "Double reads to adjudicate", count: Number(adjudications.c), href: "/oversight/adjudication", hint: null },
            {
              key: "follow_ups",
              label: "Follow-ups not closed",
              count: Number(followUps.c),
              href: "/oversight/follow-ups",
              hint: Number(followUps.c) ? "Clinically significant disagreements; a patient may need a callback" : null,
            },
            { key: "backlog", label: "Exams waiting for their final result", count: Number(backlog.c), href: null, hint: null },
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
