// Outgoing e-mail. Every message is written to the outbox table (readable in the
// browser in local mode); a nodemailer transport, when given, also delivers it.
import type { Transporter } from "nodemailer";
import type { Queryable } from "../db/client";
import { outbox } from "../db/schema";

export interface MailMessage {
  readonly to: string;
  /** The recipient's user id when the address belongs to a user. */
  readonly toUserId?: string;
  readonly subject: string;
  readonly text: string;
  readonly html?: string;
  /** What the message is about, e.g. "invitation" or "run_published". */
  readonly kind: string;
}

export interface Mailer {
  send(message: MailMessage): Promise<void>;
}

export function createOutboxMailer(db: Queryable, options: { transport?: Transporter; from?: string } = {}): Mailer {
  return {
    async send(message) {
      await db.insert(outbox).values({
        to: message.to,
        toUserId: message.toUserId ?? null,
        subject: message.subject,
        text: message.text,
        html: message.html ?? null,
        kind: message.kind,
      });
      if (options.transport) {
        await options.transport.sendMail({
          from: options.from ?? "Tributary <no-reply@tributary.invalid>",
          to: message.to,
          subject: message.subject,
          text: message.text,
          html: message.html,
        });
      }
    },
  };
}
