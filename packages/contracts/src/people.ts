import { z } from "zod";
import { roleSchema } from "./roles";

// People & access (admins): users with their role and markets, invitations by e-mail,
// and the audit log. Also the public invitation page's lookup and acceptance.

const userRefSchema = z.object({ id: z.string(), name: z.string() });
const marketRefSchema = z.object({ id: z.string(), name: z.string() });

/** GET /api/people: one user. */
export const personSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  /** Markets of a market manager; empty for roles that see every market. */
  markets: z.array(marketRefSchema),
  disabled: z.boolean(),
  createdAt: z.string(),
  /** Latest successful sign-in, from the audit log. */
  lastSignInAt: z.string().nullable(),
});
export type Person = z.infer<typeof personSchema>;

const marketIdList = z.array(z.string().min(1)).max(500).refine((ids) => new Set(ids).size === ids.length, "A market is listed twice");

/**
 * PATCH /api/people/:userId: change role, markets or disabled. A market manager needs at
 * least one market; other roles see every market, so their list must be empty (or left
 * out). A change of role or disabling ends the user's sessions. Admins cannot change
 * their own role or disable themselves, and the last enabled admin stays an admin.
 */
export const personUpdateInput = z
  .object({ role: roleSchema.optional(), marketIds: marketIdList.optional(), disabled: z.boolean().optional() })
  .refine((v) => v.role !== undefined || v.marketIds !== undefined || v.disabled !== undefined, "Send a role, markets or disabled");
export type PersonUpdateInput = z.infer<typeof personUpdateInput>;

export const invitationStatuses = ["pending", "expired", "accepted", "revoked"] as const;
export const invitationStatusSchema = z.enum(invitationStatuses);
export type InvitationStatus = z.infer<typeof invitationStatusSchema>;
export const invitationStatusLabels: Record<InvitationStatus, string> = {
  pending: "Waiting",
  expired: "Expired",
  accepted: "Accepted",
  revoked: "Revoked",
};

/** An invitation link works this long (hours), once. */
export const INVITATION_VALID_HOURS = 72;

/** GET /api/invitations: one invitation (the token is never sent back). */
export const invitationSchema = z.object({
  id: z.string(),
  email: z.string(),
  role: roleSchema,
  markets: z.array(marketRefSchema),
  status: invitationStatusSchema,
  invitedBy: userRefSchema.nullable(),
  createdAt: z.string(),
  expiresAt: z.string(),
  acceptedAt: z.string().nullable(),
  acceptedUser: userRefSchema.nullable(),
  revokedAt: z.string().nullable(),
});
export type Invitation = z.infer<typeof invitationSchema>;

/** POST /api/invitations: e-mails a one-time link (valid 72 h) to set a password. */
export const invitationInput = z.object({
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address").max(254),
  role: roleSchema,
  /** Required (at least one) for a market manager; must be empty for other roles. */
  marketIds: marketIdList.default([]),
});
export type InvitationInput = z.input<typeof invitationInput>;

/** GET /api/invitations?status=… */
export const invitationListQuery = z.object({ status: invitationStatusSchema.optional() });

/** GET /api/invitations/:token (public): what the invitation page shows before accepting. */
export const invitationLookupSchema = z.object({
  email: z.string(),
  role: roleSchema,
  expiresAt: z.string(),
  /** The company name of the workspace. */
  company: z.string(),
});
export type InvitationLookup = z.infer<typeof invitationLookupSchema>;

export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_LENGTH = 256;

/**
 * Passwords refused as too common: our own short list of patterns people reach for
 * (keyboard rows, counting, the product's name). Compared after lower-casing.
 */
export const commonPasswords: readonly string[] = [
  "123456789012",
  "1234567890123",
  "12345678901234",
  "123123123123",
  "111111111111",
  "000000000000",
  "121212121212",
  "abcdefghijkl",
  "abcd1234abcd",
  "abc123abc123",
  "password1234",
  "password12345",
  "password123456",
  "passwordpassword",
  "mypassword123",
  "p@ssw0rd1234",
  "passw0rd1234",
  "qwertyuiopas",
  "qwertyuiop12",
  "qwerty123456",
  "qwertyqwerty",
  "1qaz2wsx3edc",
  "1q2w3e4r5t6y",
  "asdfghjkl123",
  "zxcvbnm12345",
  "iloveyou1234",
  "letmein12345",
  "welcome12345",
  "welcome2024!",
  "welcome2025!",
  "welcome2026!",
  "changeme1234",
  "changemenow1",
  "administrator",
  "admin1234567",
  "adminadmin12",
  "trustno1trustno1",
  "sunshine1234",
  "football1234",
  "baseball1234",
  "monkey123456",
  "dragon123456",
  "princess1234",
  "starwars1234",
  "whatever1234",
  "superman1234",
  "secret123456",
  "summer2025!!",
  "winter2025!!",
  "tributary123",
  "tributary1234",
  "tributary2025",
  "tributary2026",
];

/**
 * Words that common passwords are built on: a password that is one of them (or one
 * repeated) with only digits and symbols around it is refused like a listed one
 * ("Password2025!", "!!welcome123"). Our own list, compared after lower-casing.
 */
export const commonPasswordWords: readonly string[] = [
  "password",
  "passw0rd",
  "p@ssw0rd",
  "qwerty",
  "qwertyuiop",
  "asdfgh",
  "zxcvbn",
  "letmein",
  "welcome",
  "iloveyou",
  "admin",
  "administrator",
  "changeme",
  "secret",
  "sunshine",
  "football",
  "baseball",
  "monkey",
  "dragon",
  "princess",
  "starwars",
  "superman",
  "whatever",
  "trustno1",
  "summer",
  "winter",
  "spring",
  "autumn",
  "tributary",
  "abc",
  "abcdef",
];

/** The password's letters without the digits and symbols around them, or null when nothing is left. */
function coreWord(lower: string): string | null {
  const core = lower.replace(/^[^a-z]+/, "").replace(/[^a-z]+$/, "");
  return core === "" ? null : core;
}

/** "dragondragon", "abcabc": one word (or chunk) repeated. */
function repeatsOf(core: string, word: string): boolean {
  return core.length % word.length === 0 && word.repeat(core.length / word.length) === core;
}

/** Fewest different characters a password must use (common practice against "aaaaaaaaaaaa" and "abababababab"). */
export const PASSWORD_MIN_DISTINCT_CHARACTERS = 5;

/**
 * What is wrong with a password for this e-mail address (empty when none): at least 12
 * characters, not the e-mail address (or its part before @), not a common password nor
 * a common word with digits and symbols around it, and not just a few characters repeated.
 * Every place that sets a password checks it with this function.
 */
export function passwordProblems(password: string, email: string): string[] {
  const problems: string[] = [];
  if (password.length < PASSWORD_MIN_LENGTH) problems.push(`Use at least ${PASSWORD_MIN_LENGTH} characters`);
  if (password.length > PASSWORD_MAX_LENGTH) problems.push(`Use at most ${PASSWORD_MAX_LENGTH} characters`);
  const lower = password.trim().toLowerCase();
  const address = email.trim().toLowerCase();
  const local = address.split("@")[0] ?? "";
  if (lower === address || (local.length > 0 && lower === local)) problems.push("Do not use your e-mail address as the password");
  const core = coreWord(lower);
  if (commonPasswords.includes(lower) || (core !== null && commonPasswordWords.some((word) => repeatsOf(core, word)))) {
    problems.push("This password is too common; choose another");
  } else if (new Set(Array.from(password)).size < PASSWORD_MIN_DISTINCT_CHARACTERS && password.length > 0) {
    problems.push(`Use at least ${PASSWORD_MIN_DISTINCT_CHARACTERS} different characters`);
  }
  return problems;
}

/** POST /api/invitations/:token/accept (public): creates the account and signs the person in. */
export const acceptInvitationInput = z.object({
  name: z.string("Enter your name").trim().min(1, "Enter your name").max(120, "Keep the name under 120 characters"),
  password: z.string("Choose a password").max(PASSWORD_MAX_LENGTH, `Use at most ${PASSWORD_MAX_LENGTH} characters`),
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationInput>;

/** GET /api/audit-log?action=&userId=&page=&pageSize= (admins). */
export const auditLogQuery = z.object({
  action: z.string().trim().min(1).max(100).optional(),
  userId: z.string().trim().min(1).optional(),
  page: z.coerce.number("The page must be a number").int().min(1, "Pages start at 1").default(1),
  pageSize: z.coerce.number("The page size must be a number").int().min(1).max(200, "At most 200 entries per page").default(50),
});
export type AuditLogQuery = z.input<typeof auditLogQuery>;

export const auditEntrySchema = z.object({
  id: z.number().int(),
  at: z.string(),
  /** Who acted; null for the system or a deleted user. */
  user: userRefSchema.nullable(),
  action: z.string(),
  /** What was acted on, e.g. "user:<id>", "plan:<id>", "invitation:<id>". */
  target: z.string().nullable(),
  details: z.unknown(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;

export const auditLogPageSchema = z.object({
  entries: z.array(auditEntrySchema),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
  /** Every action in the log, for the filter. */
  actions: z.array(z.string()),
});
export type AuditLogPage = z.infer<typeof auditLogPageSchema>;
