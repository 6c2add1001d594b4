import "server-only";
import type { DecidedSignoff, RequestedSignoffs, SignoffRecipient, SignoffView } from "@/db/queries/signoffs";
import { sendMail, type MailInput } from "@/lib/server/mail/send";
import { appLink } from "@/lib/server/mail/templates";
import { mailKeys, takeMailAllowance } from "@/lib/server/mail/rate-limit";

function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[ch] ?? ch);
}

/** The scenario page of a sign-off, where the panel shows it. */
export function signoffLink(s: Pick<SignoffView, "projectId" | "scenarioId">): string {
  return appLink(`/projects/${s.projectId}/scenarios/${s.scenarioId}`);
}

export function signoffRequestedMail({ to, signoff, requesterName, projectName }: { to: string; signoff: SignoffView; requesterName: string; projectName: string }): MailInput {
  const link = signoffLink(signoff);
  const what = `${signoff.scenarioName}, revision ${signoff.revisionNumber}`;
  const subject = `Sign-off requested: ${what} (${projectName})`;
  const note = signoff.requestNote.trim();
  const text = [
    `${requesterName} asks you to sign off "${what}" in the project "${projectName}" on Portolan.`,
    ...(note ? ["", `Note: ${note}`] : []),
    "",
    `Review it, download its bundle and record your decision: ${link}`,
    "",
    "You receive this because sign-off e-mails are on in your account settings.",
  ].join("\n");
  const html = `<p>${escapeHtml(requesterName)} asks you to sign off <strong>${escapeHtml(what)}</strong> in the project <strong>${escapeHtml(projectName)}</strong> on Portolan.</p>${note ? `<p>Note: ${escapeHtml(note)}</p>` : ""}<p><a href="${escapeHtml(link)}">Review and sign off</a></p><p>You receive this because sign-off e-mails are on in your account settings.</p>`;
  return { to, subject, text, html };
}

export function signoffDecidedMail({ to, signoff, projectName }: { to: string; signoff: SignoffView; projectName: string }): MailInput {
  const link = signoffLink(signoff);
  const what = `${signoff.scenarioName}, revision ${signoff.revisionNumber}`;
  const approved = signoff.state === "approved";
  const verb = approved ? "approved" : "requested changes to";
  const subject = `${approved ? "Approved" : "Changes requested"}: ${what} (${projectName})`;
  const comment = signoff.comment.trim();
  const text = [
    `${signoff.reviewer.name} ${verb} "${what}" in the project "${projectName}".`,
    ...(comment ? ["", `Comment: ${comment}`] : []),
    "",
    `Open the scenario: ${link}`,
    "",
    "You receive this because sign-off e-mails are on in your account settings.",
  ].join("\n");
  const html = `<p>${escapeHtml(signoff.reviewer.name)} ${verb} <strong>${escapeHtml(what)}</strong> in the project <strong>${escapeHtml(projectName)}</strong>.</p>${comment ? `<p>Comment: ${escapeHtml(comment)}</p>` : ""}<p><a href="${escapeHtml(link)}">Open the scenario</a></p><p>You receive this because sign-off e-mails are on in your account settings.</p>`;
  return { to, subject, text, html };
}

/** Who was e-mailed, who was skipped (setting off, or the hourly mail limit reached) and whose mail failed. */
export type MailOutcome = { sent: string[]; skipped: string[]; failed: string[] };

async function deliver(senderId: string, pairs: { recipient: SignoffRecipient; mail: MailInput }[]): Promise<MailOutcome> {
  const outcome: MailOutcome = { sent: [], skipped: [], failed: [] };
  for (const { recipient, mail } of pairs) {
    // The limit per recipient and per sender keeps sign-off requests from being used to flood inboxes.
    if (!recipient.notifySignoff || !(await takeMailAllowance(mailKeys.signoff(recipient.email, senderId)))) {
      outcome.skipped.push(recipient.email);
      continue;
    }
    try {
      await sendMail(mail);
      outcome.sent.push(recipient.email);
    } catch (error) {
      // the sign-off is recorded either way; the panel shows it, so a mail outage only loses the nudge
      console.error("[signoff] mail failed:", error instanceof Error ? error.message : String(error));
      outcome.failed.push(recipient.email);
    }
  }
  return outcome;
}

/** E-mail each reviewer of a new request (if they keep sign-off e-mails on). */
export async function notifySignoffRequested(req: RequestedSignoffs): Promise<MailOutcome> {
  return deliver(
    req.requester.id,
    req.signoffs.map((s) => {
      const recipient = req.reviewers.find((r) => r.id === s.reviewer.id)!;
      return { recipient, mail: signoffRequestedMail({ to: recipient.email, signoff: s, requesterName: req.requester.name, projectName: req.projectName }) };
    }),
  );
}

/** E-mail the requester of a decided sign-off (if they keep sign-off e-mails on). */
export async function notifySignoffDecided(d: DecidedSignoff): Promise<MailOutcome> {
  if (!d.requester) return { sent: [], skipped: [], failed: [] };
  return deliver(d.signoff.reviewer.id, [{ recipient: d.requester, mail: signoffDecidedMail({ to: d.requester.email, signoff: d.signoff, projectName: d.projectName }) }]);
}
