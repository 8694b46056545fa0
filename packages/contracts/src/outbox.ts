import { z } from "zod";

// The Outbox screen (admins): every e-mail the product sent, newest first. In local mode
// this is the only delivery; with SMTP configured the messages are also sent.

/** What a message is about. */
export const mailKinds = ["invitation", "run_published", "plan_submitted", "plan_approved", "plan_rejected"] as const;
export const mailKindLabels: Record<(typeof mailKinds)[number], string> = {
  invitation: "Invitation",
  run_published: "New fit published",
  plan_submitted: "Plan submitted",
  plan_approved: "Plan approved",
  plan_rejected: "Plan rejected",
};

/** GET /api/outbox?kind=&to=&page=&pageSize= */
export const outboxQuery = z.object({
  kind: z.string().trim().min(1).max(100).optional(),
  /** Part of the recipient's address (case-insensitive). */
  to: z.string().trim().min(1).max(254).optional(),
  page: z.coerce.number("The page must be a number").int().min(1, "Pages start at 1").default(1),
  pageSize: z.coerce.number("The page size must be a number").int().min(1).max(200, "At most 200 messages per page").default(50),
});
export type OutboxQuery = z.input<typeof outboxQuery>;

export const outboxMessageSummarySchema = z.object({
  id: z.string(),
  to: z.string(),
  /** The recipient when the address belongs to a user. */
  toUser: z.object({ id: z.string(), name: z.string() }).nullable(),
  subject: z.string(),
  kind: z.string(),
  createdAt: z.string(),
});
export type OutboxMessageSummary = z.infer<typeof outboxMessageSummarySchema>;

export const outboxPageSchema = z.object({
  messages: z.array(outboxMessageSummarySchema),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
});
export type OutboxPage = z.infer<typeof outboxPageSchema>;

/** GET /api/outbox/:messageId: the whole message. Show `html` only in a sandboxed frame. */
export const outboxMessageSchema = outboxMessageSummarySchema.extend({
  text: z.string(),
  html: z.string().nullable(),
});
export type OutboxMessage = z.infer<typeof outboxMessageSchema>;
