import { ROLE_LABELS, type RoleName } from "~/lib/roles";
import { absoluteUrl, renderMail, type RenderedMail } from "./templates";

/** Messages about accounts: invitations and password resets. */

export function invitationMail(input: {
  baseUrl: string;
  companyName: string;
  invitedByName: string;
  role: RoleName;
  token: string;
  expiresAt: Date;
}): RenderedMail {
  const link = absoluteUrl(input.baseUrl, `/invite/${input.token}`);
  const expires = input.expiresAt.toISOString().slice(0, 10);
  return renderMail({
    subject: `${input.invitedByName} invited you to ${input.companyName} on Patina`,
    preview: `Join ${input.companyName} as ${ROLE_LABELS[input.role].toLowerCase()}.`,
    blocks: [
      { kind: "paragraph", text: `${input.invitedByName} invited you to join ${input.companyName} on Patina as ${ROLE_LABELS[input.role].toLowerCase()}.` },
      { kind: "paragraph", text: "Choose your name and a password, and you are in." },
      { kind: "button", href: link, label: "Accept the invitation" },
      { kind: "small", text: `The link works once and until ${expires} (UTC). If you did not expect it, ignore this message: nothing happens without it.` },
    ],
    footer: [`Sent by Patina for ${input.companyName}.`],
  });
}

export function passwordResetMail(input: { baseUrl: string; name: string; token: string; validMinutes: number }): RenderedMail {
  const link = absoluteUrl(input.baseUrl, `/reset-password?token=${encodeURIComponent(input.token)}`);
  return renderMail({
    subject: "Choose a new Patina password",
    preview: "A link to choose a new password.",
    blocks: [
      { kind: "paragraph", text: `Hello ${input.name},` },
      { kind: "paragraph", text: "Someone asked for a new password for your Patina account. If it was you, choose one here:" },
      { kind: "button", href: link, label: "Choose a new password" },
      {
        kind: "small",
        text: `The link works once, for ${input.validMinutes} minutes. If you did not ask, ignore this message: your password stays as it is.`,
      },
    ],
    footer: ["Sent by Patina."],
  });
}
