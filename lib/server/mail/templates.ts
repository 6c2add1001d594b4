import "server-only";
import type { Role } from "@/db/schema";
import { getEnv } from "@/lib/base/env";
import type { MailInput } from "./send";

function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[ch] ?? ch);
}

export function appLink(pathname: string): string {
  return `${getEnv().appUrl}${pathname}`;
}

export function invitationMail({
  to,
  token,
  projectName,
  role,
  inviterName,
}: {
  to: string;
  token: string;
  projectName: string;
  role: Role;
  inviterName: string;
}): MailInput {
  const link = appLink(`/invite/${token}`);
  const subject = `${inviterName} invited you to ${projectName} on Portolan`;
  const text = [
    `${inviterName} invited you to join the project "${projectName}" on Portolan as ${role}.`,
    "",
    `Accept the invitation: ${link}`,
    "",
    "The link works once and expires in 7 days. If you did not expect this, ignore this message.",
  ].join("\n");
  const html = `<p>${escapeHtml(inviterName)} invited you to join the project <strong>${escapeHtml(projectName)}</strong> on Portolan as ${role}.</p><p><a href="${escapeHtml(link)}">Accept the invitation</a></p><p>The link works once and expires in 7 days. If you did not expect this, ignore this message.</p>`;
  return { to, subject, text, html };
}

export function passwordResetMail({ to, token }: { to: string; token: string }): MailInput {
  const link = appLink(`/reset-password/${token}`);
  const subject = "Reset your Portolan password";
  const text = [
    "Someone asked to reset the password of your Portolan account.",
    "",
    `Choose a new password: ${link}`,
    "",
    "The link works once and expires in 1 hour. If it was not you, ignore this message; your password stays as it is.",
  ].join("\n");
  const html = `<p>Someone asked to reset the password of your Portolan account.</p><p><a href="${escapeHtml(link)}">Choose a new password</a></p><p>The link works once and expires in 1 hour. If it was not you, ignore this message; your password stays as it is.</p>`;
  return { to, subject, text, html };
}

/** Sent instead of creating an account when someone signs up with an address that already has one. */
export function signUpExistingAccountMail({ to }: { to: string }): MailInput {
  const signIn = appLink("/sign-in");
  const reset = appLink("/forgot-password");
  const subject = "Someone tried to create a Portolan account with your address";
  const text = [
    "Someone tried to create a new Portolan account with this e-mail address, which already has an account. Nothing was changed.",
    "",
    `If it was you, sign in: ${signIn}`,
    `Forgot your password? Choose a new one: ${reset}`,
    "",
    "If it was not you, ignore this message.",
  ].join("\n");
  const html = `<p>Someone tried to create a new Portolan account with this e-mail address, which already has an account. Nothing was changed.</p><p>If it was you, <a href="${escapeHtml(signIn)}">sign in</a>, or <a href="${escapeHtml(reset)}">choose a new password</a> if you forgot it.</p><p>If it was not you, ignore this message.</p>`;
  return { to, subject, text, html };
}

/** Sent when a new account was created by sign-up. */
export function welcomeMail({ to, name }: { to: string; name: string }): MailInput {
  const signIn = appLink("/sign-in");
  const subject = "Your Portolan account is ready";
  const text = [`Hello ${name},`, "", `Your Portolan account for this address is ready. Sign in: ${signIn}`, "", "If you did not create it, tell your Portolan administrator."].join("\n");
  const html = `<p>Hello ${escapeHtml(name)},</p><p>Your Portolan account for this address is ready. <a href="${escapeHtml(signIn)}">Sign in</a>.</p><p>If you did not create it, tell your Portolan administrator.</p>`;
  return { to, subject, text, html };
}

/** Sent to the new address when someone asks to move their account to it. */
export function emailChangeMail({ to, name, token }: { to: string; name: string; token: string }): MailInput {
  const link = appLink(`/confirm-email/${token}`);
  const subject = "Confirm your new Portolan e-mail address";
  const text = [
    `${name} asked to use this address for their Portolan account.`,
    "",
    `Confirm it: ${link}`,
    "",
    "The link works once and expires in 24 hours. Until it is used, the account keeps its old address. If you did not ask for this, ignore this message.",
  ].join("\n");
  const html = `<p>${escapeHtml(name)} asked to use this address for their Portolan account.</p><p><a href="${escapeHtml(link)}">Confirm the new address</a></p><p>The link works once and expires in 24 hours. Until it is used, the account keeps its old address. If you did not ask for this, ignore this message.</p>`;
  return { to, subject, text, html };
}
