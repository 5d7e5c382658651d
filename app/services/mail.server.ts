import nodemailer, { type Transporter } from "nodemailer";
import { env } from "~/utils/env.server";

export type Mail = { to: string; subject: string; text: string; html: string };

/** The longest the SMTP server may keep one step of a send waiting. */
export const SMTP_TIMEOUT_MS = 15_000;

let transport: { key: string; transporter: Transporter } | undefined;

function transporter(): Transporter {
  const { SMTP_HOST, SMTP_PORT } = env();
  const key = `${SMTP_HOST}:${SMTP_PORT}`;
  if (transport?.key !== key) {
    // STARTTLS is used whenever the server offers it; the local catcher does not.
    // Bounded waits, so a send always ends well within the outbox worker's claim on its row.
    transport = {
      key,
      transporter: nodemailer.createTransport({
        host: SMTP_HOST,
        port: SMTP_PORT,
        secure: SMTP_PORT === 465,
        connectionTimeout: SMTP_TIMEOUT_MS,
        greetingTimeout: SMTP_TIMEOUT_MS,
        socketTimeout: SMTP_TIMEOUT_MS,
      }),
    };
  }
  return transport.transporter;
}

/** Sends one message with a plain-text part and an HTML part; a failure throws, so no step pretends a mail went out. */
export async function sendMail(mail: Mail, headers?: Record<string, string>) {
  await transporter().sendMail({ from: env().MAIL_FROM, ...mail, headers });
}
