import { z } from "zod";

// Portfolio settings (admins): the company name, the reporting currency, what a new
// customer is worth to each brand, the brands' and markets' display names, and the
// channels' display names and order. The same schemas check the Portfolio settings form
// in the browser and every write on the server.

export const portfolioSettingsBounds = {
  companyName: { max: 120 },
  channelName: { max: 60 },
  /** As long as a brand or market name a data file may bring (the intake's limit). */
  brandName: { max: 100 },
  marketName: { max: 100 },
  /** Largest customer value accepted (in the reporting currency): far above any real one, well inside double precision. */
  customerValue: { max: 1_000_000_000 },
  brands: { max: 500 },
  markets: { max: 500 },
  channels: { max: 200 },
} as const;

let currencies: { list: readonly string[]; set: ReadonlySet<string> } | null = null;

/** The ISO 4217 codes the runtime can format money in (`Intl.supportedValuesOf`), alphabetical. */
export function currencyCodes(): readonly string[] {
  if (!currencies) {
    const list = [...Intl.supportedValuesOf("currency")].sort();
    currencies = { list, set: new Set(list) };
  }
  return currencies.list;
}

export function isCurrencyCode(code: string): boolean {
  currencyCodes();
  return currencies!.set.has(code);
}

/** Invisible characters with no place in a name (zero-width space, word joiners, byte-order mark, soft hyphen). */
const INVISIBLE = /[\u00AD\u200B\u2060-\u2064\uFEFF]/g;
/** Direction embeddings, overrides and isolates: they can make a name read backwards. */
const DIRECTION_CONTROLS = /[\u202A-\u202E\u2066-\u2069]/;
/** Joiners and direction marks are kept for display but ignored when names are compared. */
const IGNORED_IN_KEY = /[\u200C-\u200F]/g;

/** A name as stored and shown: Unicode-composed, invisible characters dropped, trimmed, inner spaces collapsed. */
export function tidyName(raw: string): string {
  return raw.normalize("NFC").replace(INVISIBLE, "").trim().replace(/\s+/g, " ");
}

/** The key under which two names are the same (case, spacing and joiners aside). */
export function nameKey(raw: string): string {
  return tidyName(raw).replace(IGNORED_IN_KEY, "").toLowerCase();
}

/** Why a (tidied) name cannot be used, as the end of a sentence, or null when it is fine. */
export function nameProblem(name: string): string | null {
  if (/[\u0000-\u001f\u007f-\u009f]/.test(name)) return "contains control characters";
  if (DIRECTION_CONTROLS.test(name)) return "contains text-direction control characters, which can make it read backwards";
  if (/[\uD800-\uDFFF]/.test(name.replace(/[\uD800-\uDBFF][\uDC00-\uDFFF]/g, ""))) return "contains a broken character";
  // Spreadsheets run cells starting with these as formulas (OWASP, "CSV Injection").
  if (/^[=+\-@]/.test(name)) return `starts with "${name[0]}", which spreadsheets read as a formula`;
  return null;
}

const nameField = (what: string, max: number) =>
  z
    .string(`Enter ${what.toLowerCase()} as text`)
    .overwrite(tidyName)
    .min(1, `${what} cannot be empty`)
    .max(max, { message: `Keep ${what.toLowerCase()} to ${max} characters`, abort: true })
    .superRefine((name, ctx) => {
      const problem = nameProblem(name);
      if (problem) ctx.addIssue({ code: "custom", message: `${what} ${problem}` });
    });

export const companyNameField = nameField("The company name", portfolioSettingsBounds.companyName.max);
export const channelNameField = nameField("The channel name", portfolioSettingsBounds.channelName.max);
export const brandNameField = nameField("The brand name", portfolioSettingsBounds.brandName.max);
export const marketNameField = nameField("The market name", portfolioSettingsBounds.marketName.max);

/** A three-letter ISO 4217 code that money can be formatted in ("eur" is read as "EUR"). */
export const currencyCodeField = z
  .string("Choose the reporting currency")
  .trim()
  .toUpperCase()
  .regex(/^[A-Z]{3}$/, { message: "Use a three-letter ISO 4217 currency code, such as EUR", abort: true })
  .refine(isCurrencyCode, "This is not an ISO 4217 currency code we can show money in");

/** What a new customer is worth to a brand, in the reporting currency; null when unknown. */
export const customerValueField = z
  .number("Enter the customer value as a number, or leave it empty when it is not known")
  .refine(Number.isFinite, { message: "The customer value must be a finite number", abort: true })
  .refine((x) => x > 0, { message: "The customer value must be above 0 (leave it empty when it is not known)", abort: true })
  .refine((x) => x <= portfolioSettingsBounds.customerValue.max, `The customer value must be at most ${portfolioSettingsBounds.customerValue.max.toLocaleString("en")}`)
  .nullable();

// ---------------------------------------------------------------------------------
// Responses
// ---------------------------------------------------------------------------------

export const settingsBrandSchema = z.object({ id: z.string(), code: z.string(), name: z.string(), customerValue: z.number().nullable() });
export const settingsMarketSchema = z.object({ id: z.string(), code: z.string(), name: z.string() });
export const settingsChannelSchema = z.object({ id: z.string(), code: z.string(), name: z.string(), position: z.number().int() });

/** GET /api/portfolio-settings (admins), and the answer of every write. */
export const portfolioSettingsSchema = z.object({
  company: z.string(),
  currency: z.string(),
  /** Every brand, by name. */
  brands: z.array(settingsBrandSchema),
  /** Every market, by name. */
  markets: z.array(settingsMarketSchema),
  /** Every channel, in display order. */
  channels: z.array(settingsChannelSchema),
  updatedAt: z.string(),
});
export type PortfolioSettings = z.infer<typeof portfolioSettingsSchema>;
export type SettingsBrand = z.infer<typeof settingsBrandSchema>;
export type SettingsMarket = z.infer<typeof settingsMarketSchema>;
export type SettingsChannel = z.infer<typeof settingsChannelSchema>;

// ---------------------------------------------------------------------------------
// Writes
// ---------------------------------------------------------------------------------

/**
 * PATCH /api/portfolio-settings/company: the company name and/or the reporting currency.
 * A new currency relabels every money figure; it does not convert any number.
 */
export const companySettingsInput = z
  .object({ companyName: companyNameField.optional(), currency: currencyCodeField.optional() })
  .refine((v) => v.companyName !== undefined || v.currency !== undefined, "Send a company name or a currency");
export type CompanySettingsInput = z.input<typeof companySettingsInput>;

const idField = (what: string) => z.string(`Give the ${what}'s id`).min(1, `Give the ${what}'s id`).max(200, `This is not a ${what} id`);

/** PUT /api/portfolio-settings/customer-values: the value of a new customer for the brands listed (others stay as they are). */
export const customerValuesInput = z.object({
  brands: z
    .array(z.object({ id: idField("brand"), customerValue: customerValueField }), "List the brands and their customer values")
    .min(1, "List at least one brand")
    .max(portfolioSettingsBounds.brands.max, `List at most ${portfolioSettingsBounds.brands.max} brands`)
    .superRefine((list, ctx) => {
      const seen = new Set<string>();
      list.forEach((brand, i) => {
        if (seen.has(brand.id)) ctx.addIssue({ code: "custom", path: [i, "id"], message: "This brand is listed twice" });
        seen.add(brand.id);
      });
    }),
});
export type CustomerValuesInput = z.input<typeof customerValuesInput>;

/** PUT /api/portfolio-settings/channels: every channel once, in the new display order, with its display name. */
export const channelSettingsInput = z.object({
  channels: z
    .array(z.object({ id: idField("channel"), name: channelNameField }), "List every channel with its name")
    .min(1, "List every channel")
    .max(portfolioSettingsBounds.channels.max, `List at most ${portfolioSettingsBounds.channels.max} channels`)
    .superRefine((list, ctx) => {
      const ids = new Set<string>();
      const names = new Map<string, number>();
      list.forEach((channel, i) => {
        if (ids.has(channel.id)) ctx.addIssue({ code: "custom", path: [i, "id"], message: "This channel is listed twice" });
        ids.add(channel.id);
        const key = nameKey(channel.name);
        const first = names.get(key);
        if (first !== undefined) ctx.addIssue({ code: "custom", path: [i, "name"], message: `Another channel is already called "${list[first]!.name}"` });
        else names.set(key, i);
      });
    }),
});
export type ChannelSettingsInput = z.input<typeof channelSettingsInput>;

/** A list of `{ id, name }` renames: each id once, and no two names the same (case, spacing and joiners aside). */
const renameList = (what: "brand" | "market", field: typeof brandNameField, max: number) =>
  z
    .array(z.object({ id: idField(what), name: field }), `List the ${what}s and their new names`)
    .min(1, `List at least one ${what}`)
    .max(max, `List at most ${max} ${what}s`)
    .superRefine((list, ctx) => {
      const ids = new Set<string>();
      const names = new Map<string, number>();
      list.forEach((entry, i) => {
        if (ids.has(entry.id)) ctx.addIssue({ code: "custom", path: [i, "id"], message: `This ${what} is listed twice` });
        ids.add(entry.id);
        const key = nameKey(entry.name);
        const first = names.get(key);
        if (first !== undefined) ctx.addIssue({ code: "custom", path: [i, "name"], message: `Another ${what} is already called "${list[first]!.name}"` });
        else names.set(key, i);
      });
    });

/**
 * PUT /api/portfolio-settings/brand-names: new display names for the brands listed (others
 * keep theirs). Codes never change: data files and links name brands by code.
 */
export const brandNamesInput = z.object({ brands: renameList("brand", brandNameField, portfolioSettingsBounds.brands.max) });
export type BrandNamesInput = z.input<typeof brandNamesInput>;

/** PUT /api/portfolio-settings/market-names: new display names for the markets listed (others keep theirs; codes never change). */
export const marketNamesInput = z.object({ markets: renameList("market", marketNameField, portfolioSettingsBounds.markets.max) });
export type MarketNamesInput = z.input<typeof marketNamesInput>;

/** The audit log's actions for portfolio settings. */
export const portfolioSettingsActions = {
  companyName: "company_name_changed",
  currency: "currency_changed",
  customerValue: "customer_value_changed",
  channelName: "channel_renamed",
  channelOrder: "channel_order_changed",
  brandName: "brand_renamed",
  marketName: "market_renamed",
} as const;
