// The product's e-mails: subject, plain text and HTML of each, built from plain values
// only (no database), so a test can read exactly what a recipient gets. Anything that
// comes from people (names, comments) is escaped in the HTML.
import type { Request } from "express";
import { INVITATION_VALID_HOURS, modelCaution, roleLabels, type Role } from "@tributary/contracts";
import type { AppConfig } from "../config";
import type { MailMessage } from "./mailer";

export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[ch]!);
}

/** The app's address for links: PUBLIC_URL when set, else the address the request came to. */
export function appBaseUrl(config: Pick<AppConfig, "publicUrl">, req: Request): string {
  return config.publicUrl ?? `${req.protocol}://${req.get("host") ?? "localhost"}`;
}

interface Paragraphs {
  readonly heading: string;
  readonly paragraphs: readonly string[];
  readonly link?: { readonly label: string; readonly url: string };
  readonly table?: { readonly head: readonly string[]; readonly rows: readonly (readonly string[])[] };
  readonly footer?: string;
}

/**
 * The inline styles of the e-mails' HTML, the only ones they use. The Outbox shows a
 * message in a sandboxed srcdoc frame, which inherits the app's Content-Security-Policy;
 * the policy allows exactly these style attributes by their hashes (security-headers.ts).
 */
export const emailInlineStyles = {
  body: "font-family:system-ui,sans-serif;color:#1d2a33;line-height:1.5",
  heading: "font-size:18px",
  table: "border-collapse:collapse;font-size:14px",
  cell: "text-align:left;padding:4px 10px;border-bottom:1px solid #d9dee3",
  footer: "color:#5b6b76;font-size:13px",
} as const;

/** Plain text and HTML of the same content. */
function render(content: Paragraphs): { text: string; html: string } {
  const text: string[] = [content.heading, ""];
  for (const p of content.paragraphs) text.push(p, "");
  if (content.table) {
    text.push(content.table.head.join(" | "));
    for (const row of content.table.rows) text.push(row.join(" | "));
    text.push("");
  }
  if (content.link) text.push(`${content.link.label}: ${content.link.url}`, "");
  if (content.footer) text.push(content.footer);
  const cell = (tag: "th" | "td", value: string) => `<${tag} style="${emailInlineStyles.cell}">${escapeHtml(value)}</${tag}>`;
  const html = [
    `<!doctype html><html><body style="${emailInlineStyles.body}">`,
    `<h1 style="${emailInlineStyles.heading}">${escapeHtml(content.heading)}</h1>`,
    ...content.paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`),
    content.table
      ? `<table style="${emailInlineStyles.table}"><thead><tr>${content.table.head.map((h) => cell("th", h)).join("")}</tr></thead><tbody>${content.table.rows
          .map((row) => `<tr>${row.map((v) => cell("td", v)).join("")}</tr>`)
          .join("")}</tbody></table>`
      : "",
    content.link ? `<p><a href="${escapeHtml(content.link.url)}">${escapeHtml(content.link.label)}</a></p>` : "",
    content.footer ? `<p style="${emailInlineStyles.footer}">${escapeHtml(content.footer)}</p>` : "",
    `</body></html>`,
  ].join("\n");
  return { text: text.join("\n").trimEnd() + "\n", html };
}

const role = (r: Role) => roleLabels[r].toLowerCase();

export function invitationMessage(input: {
  to: string;
  company: string;
  role: Role;
  marketNames: readonly string[];
  invitedBy: string;
  acceptUrl: string;
}): MailMessage {
  const scope = input.role === "market_manager" ? ` for ${input.marketNames.join(", ")}` : "";
  const body = render({
    heading: `You are invited to Tributary`,
    paragraphs: [
      `${input.invitedBy} invited you to ${input.company}'s Tributary workspace as ${role(input.role)}${scope}.`,
      `Open the link below to choose your name and a password (at least 12 characters). The link works once and expires in ${INVITATION_VALID_HOURS} hours.`,
    ],
    link: { label: "Accept the invitation", url: input.acceptUrl },
    footer: "If you did not expect this invitation, ignore this e-mail; nothing happens until the link is used.",
  });
  return { to: input.to, subject: `Your invitation to ${input.company} on Tributary`, kind: "invitation", ...body };
}

/** One cell × channel headline of a published run, as a market manager's e-mail lists it. */
export interface PublishedHeadline {
  readonly brand: string;
  readonly market: string;
  /** The channel's display name (the e-mail is read by people, not parsed). */
  readonly channelName: string;
  readonly cacMedian: number;
  readonly cacLow: number;
  readonly cacHigh: number;
}

function money(x: number, currency: string): string {
  const digits = Math.abs(x) >= 100 ? 0 : Math.abs(x) >= 10 ? 1 : 2;
  return `${x.toLocaleString("en-GB", { minimumFractionDigits: digits, maximumFractionDigits: digits })} ${currency}`.trim();
}

/**
 * "A new fit is published" for a market manager: only their markets are named, in the
 * subject, the text and the HTML. The analyst's free-text publish reason is not quoted
 * (it may name any market); the e-mail says whether there is one.
 */
export function runPublishedMessage(input: {
  to: string;
  toUserId: string;
  recipientName: string;
  marketNames: readonly string[];
  currency: string;
  trustworthy: boolean | null;
  hasPublishReason: boolean;
  headlines: readonly PublishedHeadline[];
  deskUrl: string;
}): MailMessage {
  const markets = input.marketNames.join(", ");
  const paragraphs = [
    `Hello ${input.recipientName},`,
    `A new fit of the media mix model was published. Below is the cost per new customer at low spend (median and 90 % interval) for each brand and channel in ${markets}.`,
  ];
  if (input.trustworthy === false) paragraphs.push("This fit did not pass every convergence check (R-hat, effective sample size, divergences); treat its numbers with extra care.");
  if (input.hasPublishReason) paragraphs.push("The analyst who published it wrote a note on why it can be used; read it on the Market desk.");
  if (input.headlines.length === 0) paragraphs.push(`The fit has no estimates for ${markets}.`);
  paragraphs.push(modelCaution);
  const body = render({
    heading: `New estimates for ${markets}`,
    paragraphs,
    table:
      input.headlines.length > 0
        ? {
            head: ["Brand", "Market", "Channel", "Cost per customer (median)", "90 % interval"],
            rows: input.headlines.map((h) => [h.brand, h.market, h.channelName, money(h.cacMedian, input.currency), `${money(h.cacLow, input.currency)} – ${money(h.cacHigh, input.currency)}`]),
          }
        : undefined,
    link: { label: "Open the Market desk", url: input.deskUrl },
    footer: "You get this e-mail as a market manager in Tributary.",
  });
  return { to: input.to, toUserId: input.toUserId, subject: `New estimates for ${markets} are published`, kind: "run_published", ...body };
}

export interface PlanMailFacts {
  readonly planName: string;
  readonly authorName: string;
  readonly totalBudget: number;
  readonly horizon: number;
  readonly currency: string;
  readonly marketNames: readonly string[];
  readonly planUrl: string;
}

export function planSubmittedMessage(to: { email: string; id: string; name: string }, plan: PlanMailFacts): MailMessage {
  const body = render({
    heading: `Budget split "${plan.planName}" waits for your decision`,
    paragraphs: [
      `Hello ${to.name},`,
      `${plan.authorName} submitted the budget split "${plan.planName}" for approval: ${money(plan.totalBudget, plan.currency)} over ${plan.horizon} weeks in ${plan.marketNames.join(", ")}.`,
      modelCaution,
    ],
    link: { label: "Review the budget split", url: plan.planUrl },
  });
  return { to: to.email, toUserId: to.id, subject: `Budget split "${plan.planName}" submitted for approval`, kind: "plan_submitted", ...body };
}

export function planDecidedMessage(
  to: { email: string; id: string; name: string },
  plan: PlanMailFacts,
  decision: { approved: boolean; by: string; comment: string | null },
): MailMessage {
  const verb = decision.approved ? "approved" : "rejected";
  const paragraphs = [`Hello ${to.name},`, `${decision.by} ${verb} your budget split "${plan.planName}".`];
  if (decision.comment) paragraphs.push(`Comment: ${decision.comment}`);
  if (decision.approved) paragraphs.push(modelCaution);
  else paragraphs.push("You can change the split and submit it again.");
  const body = render({ heading: `Budget split "${plan.planName}" ${verb}`, paragraphs, link: { label: "Open the budget split", url: plan.planUrl } });
  return { to: to.email, toUserId: to.id, subject: `Budget split "${plan.planName}" ${verb}`, kind: decision.approved ? "plan_approved" : "plan_rejected", ...body };
}
