// Home: "what needs me now", per role the caller holds, composed from the counts of each
// aggregate's repository. Only real counts: a card appears once the thing it counts exists.
import type { Db } from "../db/knex";
import type { AuthUser } from "../auth/types";
import type { Home } from "../../shared/schemas/home";
import { countExamsAwaitingResult, countOwnExams } from "../repositories/exams";
import { countFailedDraftClips } from "../repositories/clips";
import { countClaimable, countLiveClaims, countUndecidedAdjudications } from "../repositories/assignments";
import { countQuestionsAwaitingAnswer } from "../repositories/reviews";
import { countOpenFollowUps } from "../repositories/follow-ups";
import { countActiveWithRole, countMembers } from "../repositories/members";
import { countOpenInvitations } from "../repositories/invitations";

type Section = Home["sections"][number];
type Caller = Pick<AuthUser, "id" | "programId" | "programName" | "roles">;

async function sonographerSection(db: Db, pid: string, uid: string): Promise<Section> {
  const [drafts, failed, submitted] = await Promise.all([
    countOwnExams(db, pid, uid, "draft"),
    countFailedDraftClips(db, pid, uid),
    countOwnExams(db, pid, uid, "submitted"),
  ]);
  return {
    role: "sonographer",
    title: "Your scanning",
    cards: [
      { key: "drafts", label: "Drafts not yet submitted", count: drafts, href: "/exams?status=draft", hint: null },
      {
        key: "failed_clips",
        label: "Clips that failed processing",
        count: failed,
        href: "/exams?status=draft",
        hint: failed ? "Retry or remove them before submitting" : null,
      },
      { key: "submitted", label: "Submitted, waiting for review", count: submitted, href: "/exams?status=submitted", hint: null },
    ],
  };
}

async function reviewerSection(db: Db, pid: string, uid: string): Promise<Section> {
  const [waiting, held, handed, questions] = await Promise.all([
    countClaimable(db, pid, uid),
    countLiveClaims(db, pid, uid),
    countUndecidedAdjudications(db, pid, { assignedTo: uid }),
    countQuestionsAwaitingAnswer(db, pid, uid),
  ]);
  return {
    role: "reviewer",
    title: "Your reviews",
    cards: [
      { key: "queue_waiting", label: "Exams waiting for a read", count: waiting, href: "/queue", hint: null },
      {
        key: "claims_held",
        label: "Exams you hold",
        count: held,
        href: "/queue",
        hint: held ? "Finish or release them before the claim runs out" : null,
      },
      ...(handed ? [{ key: "adjudications_handed", label: "Adjudications handed to you", count: handed, href: "/oversight/adjudication", hint: null }] : []),
      ...(questions
        ? [{ key: "questions_waiting", label: "Questions from clinicians awaiting your answer", count: questions, href: "/reviews/questions", hint: null }]
        : []),
    ],
  };
}

async function leadSection(db: Db, pid: string): Promise<Section> {
  const [reviewers, clinicians, adjudications, followUps, backlog] = await Promise.all([
    countActiveWithRole(db, pid, "reviewer"),
    countActiveWithRole(db, pid, "sonographer"),
    countUndecidedAdjudications(db, pid),
    countOpenFollowUps(db, pid),
    countExamsAwaitingResult(db, pid),
  ]);
  return {
    role: "qa_lead",
    title: "Your program",
    cards: [
      { key: "adjudications", label: "Double reads to adjudicate", count: adjudications, href: "/oversight/adjudication", hint: null },
      {
        key: "follow_ups",
        label: "Follow-ups not closed",
        count: followUps,
        href: "/oversight/follow-ups",
        hint: followUps ? "Clinically significant disagreements; a patient may need a callback" : null,
      },
      { key: "backlog", label: "Exams waiting for their final result", count: backlog, href: null, hint: null },
      { key: "reviewers", label: "Active reviewers", count: reviewers, href: "/setup/people", hint: null },
      { key: "sonographers", label: "Active clinicians", count: clinicians, href: "/setup/people", hint: null },
    ],
  };
}

async function adminSection(db: Db, pid: string): Promise<Section> {
  const [open, inactive, active] = await Promise.all([countOpenInvitations(db, pid), countMembers(db, pid, "deactivated"), countMembers(db, pid, "active")]);
  return {
    role: "admin",
    title: "Administration",
    cards: [
      { key: "open_invitations", label: "Invitations waiting for an answer", count: open, href: "/setup/people", hint: null },
      { key: "active_members", label: "Active members", count: active, href: "/setup/people", hint: null },
      { key: "deactivated_members", label: "Deactivated members", count: inactive, href: "/setup/people", hint: null },
    ],
  };
}

/** The caller's home: one section per role they hold, in the order sonographer, reviewer, QA lead, admin. */
export async function homeOf(db: Db, user: Caller): Promise<Home> {
  const sections: Section[] = [];
  if (user.roles.includes("sonographer")) sections.push(await sonographerSection(db, user.programId, user.id));
  if (user.roles.includes("reviewer")) sections.push(await reviewerSection(db, user.programId, user.id));
  if (user.roles.includes("qa_lead")) sections.push(await leadSection(db, user.programId));
  if (user.roles.includes("admin")) sections.push(await adminSection(db, user.programId));
  return { programName: user.programName, sections };
}
