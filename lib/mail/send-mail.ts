// Sends e-mail over SMTP: the local fake server in development and tests, real settings in production.
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "../env";

let transporter: Transporter | undefined;

function transport(): Transporter {
  const { smtp } = env();
  transporter ??= nodemailer.createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: smtp.secure,
    auth: smtp.user ? { user: smtp.user, pass: smtp.password ?? "" } : undefined,
    tls: { rejectUnauthorized: smtp.secure },
    ignoreTLS: !smtp.secure && smtp.host === "127.0.0.1",
  });
  return transporter;
}

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
}

export async function sendMail(mail: OutgoingMail): Promise<void> {
  await transport().sendMail({ from: env().smtp.from, ...mail });
}
