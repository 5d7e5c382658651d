import nodemailer, { type Transporter } from "nodemailer";
import { env } from "~/utils/env.server";

export type Mail = { to: string; subject: string; text: string; html: string };

let transport: { key: string; transporter: Transporter } | undefined;

function transporter(): Transporter {
  const { SMTP_HOST, SMTP_PORT } = env();
  const key = `${SMTP_HOST}:${SMTP_PORT}`;
  if (transport?.key !== key) {
    // STARTTLS is used whenever the server offers it; the local catcher does not.
    transport = { key, transporter: nodemailer.createTransport({ host: SMTP_HOST, port: SMTP_PORT, secure: SMTP_PORT === 465 }) };
  }
  return transport.transporter;
}

/** Sends one message with a plain-text part and an HTML part; a failure throws, so no step pretends a mail went out. */
export async function sendMail(mail: Mail) {
  await transporter().sendMail({ from: env().MAIL_FROM, ...mail });
}

/**
 * Sends without making the request wait: where the answer must not reveal whether an account
 * exists, the SMTP round trip must not show in the response time either. A failure is logged.
 */
export function sendInBackground(mail: Mail) {
  sendMail(mail).catch((error: unknown) => {
    console.error(`Mail "${mail.subject}" to ${mail.to} was not sent:`, error);
  });
}
