import "server-only";
import nodemailer, { type Transporter } from "nodemailer";
import { getEnv } from "@/lib/base/env";

export type MailInput = { to: string; subject: string; text: string; html?: string };

const globalForMail = globalThis as unknown as { portolanMailer?: { url: string; transport: Transporter } };

function getTransport(): Transporter {
  const url = getEnv().smtpUrl;
  const existing = globalForMail.portolanMailer;
  if (existing && existing.url === url) return existing.transport;
  const transport = nodemailer.createTransport(url);
  globalForMail.portolanMailer = { url, transport };
  return transport;
}

/** Send one message over SMTP_URL. Text goes base64-encoded so long links are never soft-wrapped. */
export async function sendMail({ to, subject, text, html }: MailInput): Promise<void> {
  await getTransport().sendMail({ from: getEnv().smtpFrom, to, subject, text, html, textEncoding: "base64" });
}
