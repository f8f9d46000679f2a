// Wording of the e-mails Soundings sends. Plain text first; the HTML is the same text.
import type { MailMessage } from "./mailer";
import { ROLE_LABELS, type Role } from "../../shared/roles";

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
const htmlOf = (text: string) =>
  `<div style="font-family:sans-serif;line-height:1.5">${text
    .split("\n\n")
    .map(
      (p) =>
        `<p>${escape(p)
          .replace(/(https?:\/\/\S+)/g, '<a href="$1">$1</a>')
          .replace(/\n/g, "<br>")}</p>`,
    )
    .join("")}</div>`;

const footer = "Soundings supports education and quality review of point-of-care ultrasound. It does not make diagnoses.";

export function invitationMail(p: { to: string; programName: string; roles: Role[]; inviter: string; link: string; expiresHours: number }): MailMessage {
  const roles = p.roles.map((r) => ROLE_LABELS[r]).join(", ");
  const text = `${p.inviter} has invited you to ${p.programName} on Soundings as: ${roles}.\n\nSet your password and join here (the link works once and expires in ${p.expiresHours} hours):\n${p.link}\n\nIf you did not expect this invitation, you can ignore this e-mail.\n\n${footer}`;
  return { to: p.to, subject: `You are invited to ${p.programName} on Soundings`, text, html: htmlOf(text) };
}

export function passwordResetMail(p: { to: string; link: string; expiresMinutes: number }): MailMessage {
  const text = `Someone asked to reset the Soundings password for this address.\n\nChoose a new password here (the link works once and expires in ${p.expiresMinutes} minutes):\n${p.link}\n\nIf it was not you, ignore this e-mail: your password stays as it is.\n\n${footer}`;
  return { to: p.to, subject: "Reset your Soundings password", text, html: htmlOf(text) };
}

export function feedbackReadyMail(p: { to: string; name: string; application: string; code: string; link: string }): MailMessage {
  const text = `Hello ${p.name},\n\nThe review of your ${p.application} exam ${p.code} is complete. Read your feedback here:\n${p.link}\n\n${footer}`;
  return { to: p.to, subject: `Feedback on your ${p.application} exam ${p.code}`, text, html: htmlOf(text) };
}

export function replyMail(p: { to: string; name: string; code: string; body: string; link: string }): MailMessage {
  const text = `Hello ${p.name},\n\nThe clinician who performed exam ${p.code} replied to your feedback:\n\n${p.body}\n\nAnswer here:\n${p.link}\n\n${footer}`;
  return { to: p.to, subject: `A question about exam ${p.code}`, text, html: htmlOf(text) };
}

export function overdueDigestMail(p: {
  to: string;
  name: string;
  programName: string;
  hours: number;
  /** The shorter target of clinical exams. */
  clinicalHours?: number;
  rows: { application: string; count: number }[];
  link: string;
}): MailMessage {
  const total = p.rows.reduce((s, r) => s + r.count, 0);
  const lines = p.rows.map((r) => `  ${r.application}: ${r.count}`).join("\n");
  const text = `Hello ${p.name},\n\n${total} exam read(s) in ${p.programName} have waited longer than the program's turnaround target (${p.clinicalHours !== undefined && p.clinicalHours !== p.hours ? `${p.clinicalHours} hours for clinical exams, ${p.hours} hours for the rest` : `${p.hours} hours`}):\n${lines}\n\nOpen the queue:\n${p.link}\n\n${footer}`;
  return { to: p.to, subject: `${total} exam read(s) waiting past the turnaround target`, text, html: htmlOf(text) };
}

export function urgentFollowUpMail(p: {
  to: string;
  name: string;
  code: string;
  application: string;
  reason: string;
  dueHours: number;
  link: string;
}): MailMessage {
  const text = `Hello ${p.name},\n\nA reviewer flagged exam ${p.code} (${p.application}) as needing clinical follow-up now. Their reason:\n\n${p.reason}\n\nThe follow-up is open and due within ${p.dueHours} hours. Record what was done here:\n${p.link}\n\nThis was sent at once, before any second read or adjudication; the final read may differ. Local policy governs how patients are contacted.\n\n${footer}`;
  return { to: p.to, subject: `Urgent: exam ${p.code} needs clinical follow-up`, text, html: htmlOf(text) };
}
