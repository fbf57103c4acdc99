import nodemailer, { type Transporter } from 'nodemailer';

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
}

/** Sends through SMTP: a real server when SMTP_URL is set, otherwise the local sink. */
export function createMailer(options: { smtpUrl?: string; sinkPort?: number; sinkAuth?: { user: string; pass: string }; from: string }): Mailer {
  let transport: Transporter;
  if (options.smtpUrl) {
    transport = nodemailer.createTransport(options.smtpUrl);
  } else if (options.sinkPort) {
    transport = nodemailer.createTransport({
      host: '127.0.0.1',
      port: options.sinkPort,
      secure: false,
      ignoreTLS: true,
      auth: options.sinkAuth,
    });
  } else {
    throw new Error('No mail route: set SMTP_URL or start the local sink.');
  }
  return {
    async send(mail) {
      await transport.sendMail({ from: options.from, ...mail });
    },
  };
}
