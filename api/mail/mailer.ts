import nodemailer, { type Transporter } from 'nodemailer';

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; content: Buffer | string; contentType?: string }[];
  /** Extra MIME alternatives, e.g. an iCalendar invitation. */
  icalEvent?: { method: string; content: string; filename?: string };
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<{ messageId: string }>;
  close(): void;
}

/** Real SMTP through nodemailer; in development and tests the relay is the local catcher. */
export function createMailer(smtpUrl: string, from: string): Mailer {
  const transport: Transporter = nodemailer.createTransport(smtpUrl);
  return {
    async send(mail) {
      const info = await transport.sendMail({ from, ...mail });
      return { messageId: info.messageId };
    },
    close() {
      transport.close();
    },
  };
}
