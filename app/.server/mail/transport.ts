import nodemailer, { type Transporter } from "nodemailer";
import type SMTPTransport from "nodemailer/lib/smtp-transport";
import { serverEnv } from "../env";
import { processSingleton } from "../process-singleton";

export type OutgoingMessage = {
  to: string;
  subject: string;
  html: string;
  text: string;
  /** Stable id of the outbox row, so a receiving server can spot a resend. */
  messageId?: string;
};

/**
 * The one way out for e-mail: SMTP to the URL in PATINA_SMTP_URL, one
 * transport per URL. No pooling: each send opens its own connection (so an
 * unused transport holds none), and a server that went away and came back is
 * simply reached again on the next attempt.
 */
export function mailTransport(url = serverEnv().PATINA_SMTP_URL): Transporter {
  return processSingleton(`mail transport ${url}`, () =>
    nodemailer.createTransport({
      url,
      connectionTimeout: 10_000,
      greetingTimeout: 10_000,
      socketTimeout: 20_000,
    } satisfies SMTPTransport.Options),
  );
}

export async function sendMail(message: OutgoingMessage): Promise<void> {
  const env = serverEnv();
  await mailTransport(env.PATINA_SMTP_URL).sendMail({
    from: env.PATINA_MAIL_FROM,
    to: message.to,
    subject: message.subject,
    html: message.html,
    text: message.text,
    ...(message.messageId ? { messageId: message.messageId } : {}),
  });
}
