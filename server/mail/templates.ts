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
