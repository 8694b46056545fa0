// Every zod schema of the contracts against random and malicious input (fast-check):
// huge numbers, NaN and ±Infinity, text that spreadsheets run as formulas, right-to-left
// and zero-width characters, lone surrogates, very long strings, wrong types, deep nesting
// and prototype-pollution keys (__proto__, constructor.prototype) — thrown at the top level
// and planted anywhere inside otherwise plausible values built from the schema itself.
// The schemas are found by walking the package's exports, so a new one is covered too.
//
// For every schema and every input: parsing never throws; a refusal has at least one
// issue, each with a path and a short, readable message; an accepted value holds only
// finite numbers, plain objects with the ordinary prototype (an own "__proto__" key cannot
// change it), survives a JSON round trip unchanged in meaning, and Object.prototype is
// never touched.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import * as contracts from "./index";

// Fixed seed: every run the same; the run counts keep the file to a few seconds.
const seed = 8_020_525;

const schemas: [string, z.ZodType][] = Object.entries(contracts as Record<string, unknown>)
  .flatMap(([name, value]): [string, z.ZodType][] => (value instanceof z.ZodType ? [[name, value]] : []))
  .sort(([a], [b]) => a.localeCompare(b));

// ---------------------------------------------------------------------------------
// Hostile values
// ---------------------------------------------------------------------------------

const longText = "Ж".repeat(100_000);
const hostileStrings = [
  "",
  " ",
  "=HYPERLINK(\"https://x.example\",\"open\")",
  "+cmd|' /C calc'!A0",
  "-2+3+cmd|' /C calc'!A0",
  "@SUM(1+1)*cmd|' /C calc'!A0",
  "\t=1+1",
  "\r=1+1",
  "\u202Eexe.fdp",
  "Vel\u200Btria",
  "\u2066Kestrova\u2069",
  "a\u200Db",
  "\uFEFF",
  "\uD800",
  "\uDFFFx",
  "שוק חדש",
  "سوق",
  "𝔘𝔫𝔦𝔠𝔬𝔡𝔢",
  "Zoe\u0308",
  "\u0000",
  "line\nbreak",
  "<script>alert(1)</script>",
  "'; DROP TABLE users; --",
  "../../etc/passwd",
  "NaN",
  "Infinity",
  "-Infinity",
  "1e309",
  "0x1F",
  "__proto__",
  "constructor",
  "toString",
  longText,
  "9".repeat(400),
];
const hostileNumbers = [
  Number.NaN,
  Number.POSITIVE_INFINITY,
  Number.NEGATIVE_INFINITY,
  Number.MAX_VALUE,
  -Number.MAX_VALUE,
  Number.MIN_VALUE,
  Number.MAX_SAFE_INTEGER + 2,
  -0,
  2 ** 53,
  4_294_967_296,
  1e308 * 10,
  0.1 + 0.2,
  -1,
  1.5,
];

function deeplyNested(depth: number): unknown {
  let value: unknown = "bottom";
  for (let i = 0; i < depth; i++) value = i % 2 === 0 ? [value] : { next: value };
  return value;
}

/** Objects with own "__proto__" / "constructor" keys, as JSON.parse makes them from a request body. */
const pollutingObjects = [
  JSON.parse('{"__proto__":{"polluted":"yes"}}') as unknown,
  JSON.parse('{"constructor":{"prototype":{"polluted":"yes"}}}') as unknown,
  JSON.parse('{"__proto__":{"polluted":"yes"},"name":"x","email":"a@b.example"}') as unknown,
  Object.assign(Object.create(null) as object, { a: 1 }),
];

const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 4, arbitrary: fc.constantFrom(...hostileStrings) },
  { weight: 3, arbitrary: fc.constantFrom(...hostileNumbers) },
  { weight: 2, arbitrary: fc.constantFrom<unknown>(null, undefined, true, false, [], {}, [[[[]]]], deeplyNested(400), new Date(0), 10n, Symbol("s"), () => 1) },
  { weight: 2, arbitrary: fc.constantFrom(...pollutingObjects) },
  { weight: 2, arbitrary: fc.string({ unit: "grapheme", maxLength: 30 }) },
  { weight: 1, arbitrary: fc.string({ unit: "binary", maxLength: 30 }) },
  { weight: 1, arbitrary: fc.double() },
  { weight: 1, arbitrary: fc.anything({ maxDepth: 3, withNullPrototype: true, withBigInt: true, withDate: true, withMap: true, withSet: true }) },
);

// ---------------------------------------------------------------------------------
// Plausible values, built from a schema's own definition (so refinements deep inside are reached)
// ---------------------------------------------------------------------------------

interface Def {
  readonly type: string;
  readonly [key: string]: unknown;
}
const defOf = (schema: unknown): Def => (schema as { _zod: { def: Def } })._zod.def;
const checksOf = (def: Def) => ((def.checks as { _zod: { def: Record<string, unknown> } }[] | undefined) ?? []).map((check) => check._zod.def);

function plausible(schema: unknown, depth = 0): fc.Arbitrary<unknown> {
  const def = defOf(schema);
  const checks = checksOf(def);
  const limit = (name: string) => checks.find((c) => c.check === name);
  switch (def.type) {
    case "string": {
      const format = limit("string_format");
      if (format?.format === "email") return fc.emailAddress();
      if (format?.pattern instanceof RegExp) return fc.stringMatching(format.pattern as RegExp);
      const minLength = Number(limit("min_length")?.minimum ?? 0);
      const maxLength = Math.min(Number(limit("max_length")?.maximum ?? 24), Math.max(minLength, 24));
      return fc.oneof(
        fc.string({ minLength, maxLength: Math.max(minLength, maxLength) }),
        fc.constantFrom("2025-09-29", "2025-06-30", "search", "social", "Kestrova", "Veltria"),
      );
    }
    case "number": {
      const integer = checks.some((c) => c.check === "number_format" && (c.format === "safeint" || c.format === "int32" || c.format === "uint32"));
      const low = limit("greater_than")?.value;
      const high = limit("less_than")?.value;
      const min = typeof low === "number" ? low : -1e6;
      const max = typeof high === "number" ? high : 1e6;
      return integer
        ? fc.integer({ min: Math.ceil(Math.max(min, -(2 ** 31))), max: Math.floor(Math.min(max, 2 ** 31)) })
        : fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
    }
    case "boolean":
      return fc.boolean();
    case "enum":
      return fc.constantFrom(...Object.values(def.entries as Record<string, string>));
    case "literal":
      return fc.constantFrom(...(def.values as unknown[]));
    case "unknown":
    case "any":
      return fc.jsonValue({ maxDepth: 2 });
    case "optional":
      return fc.option(plausible(def.innerType, depth), { nil: undefined });
    case "nullable":
      return fc.option(plausible(def.innerType, depth), { nil: null });
    case "default":
    case "readonly":
    case "catch":
    case "nonoptional":
      return plausible(def.innerType, depth);
    case "pipe":
      return plausible(def.in, depth);
    case "array": {
      const minLength = Number(limit("min_length")?.minimum ?? 0);
      if (depth > 4) return fc.constant([]);
      return fc.array(plausible(def.element, depth + 1), { minLength, maxLength: Math.max(minLength, 3) });
    }
    case "record":
      return depth > 4 ? fc.constant({}) : fc.dictionary(fc.constantFrom("Kestrova", "Plumrise", "a", "b"), plausible(def.valueType, depth + 1), { maxKeys: 3 });
    case "object": {
      if (depth > 5) return fc.constant({});
      const shape = def.shape as Record<string, unknown>;
      return fc.record(Object.fromEntries(Object.entries(shape).map(([key, field]) => [key, plausible(field, depth + 1)])));
    }
    case "union":
      return fc.oneof(...(def.options as unknown[]).map((option) => plausible(option, depth + 1)));
    default:
      return fc.anything({ maxDepth: 2 });
  }
}

/** Every place inside a value (object keys and array positions), as paths. */
function pathsOf(value: unknown, prefix: (string | number)[] = [], out: (string | number)[][] = [], depth = 0): (string | number)[][] {
  out.push(prefix);
  if (depth > 8 || value === null || typeof value !== "object") return out;
  if (Array.isArray(value)) value.forEach((item, i) => pathsOf(item, [...prefix, i], out, depth + 1));
  else for (const [key, item] of Object.entries(value)) pathsOf(item, [...prefix, key], out, depth + 1);
  return out;
}

function plantAt(value: unknown, path: readonly (string | number)[], planted: unknown): unknown {
  if (path.length === 0) return planted;
  const [head, ...rest] = path;
  if (Array.isArray(value)) return value.map((item, i) => (i === head ? plantAt(item, rest, planted) : item));
  const copy: Record<string, unknown> = { ...(value as Record<string, unknown>) };
  copy[head as string] = plantAt(copy[head as string], rest, planted);
  return copy;
}

/** A plausible value with a hostile value planted somewhere, or an extra polluting key added to one of its objects. */
function mutated(schema: z.ZodType): fc.Arbitrary<unknown> {
  return fc.tuple(plausible(schema), fc.nat(), hostileValue, fc.boolean()).map(([value, pick, planted, addKey]) => {
    const paths = pathsOf(value);
    const path = paths[pick % paths.length]!;
    if (addKey) {
      const target = path.reduce<unknown>((node, key) => (node as Record<string | number, unknown>)?.[key], value);
      if (target !== null && typeof target === "object" && !Array.isArray(target)) {
        const polluted = JSON.parse(`{"__proto__":{"polluted":"yes"},"constructor":{"prototype":{"polluted":"yes"}}}`) as Record<string, unknown>;
        return plantAt(value, path, { ...polluted, ...(target as Record<string, unknown>) });
      }
    }
    return plantAt(value, path, planted);
  });
}

// ---------------------------------------------------------------------------------
// What must hold
// ---------------------------------------------------------------------------------

/**
 * Schemas that pass part of a body on unread (z.unknown) because another module checks it
 * in full; there any value may pass the schema, so only the prototype check applies.
 */
const passedOnUnread: Record<string, string> = {
  // (Values inside may be anything JavaScript can hold; over HTTP they come from JSON.parse.)
  liftTestsCreateInput: "each test is checked by validateLiftTest (packages/intake, properties.test.ts)",
  validateUploadInput: "the mapping is checked by analyseTidyRows (packages/intake, properties.test.ts)",
};

/** Objects reached by an accepted value: plain prototypes only, finite numbers only. */
function checkAccepted(name: string, output: unknown): void {
  if (name in passedOnUnread) {
    expect(Object.getPrototypeOf(output), name).toBe(Object.prototype);
    return;
  }
  const seen = new Set<unknown>();
  const visit = (node: unknown, where: string) => {
    if (typeof node === "number") {
      if (!Number.isFinite(node)) throw new Error(`${name} accepted a non-finite number at ${where}`);
      return;
    }
    if (node === null || typeof node !== "object" || seen.has(node)) return;
    seen.add(node);
    if (node instanceof Date || node instanceof Float64Array || node instanceof Uint8Array) return;
    const proto = Object.getPrototypeOf(node) as unknown;
    if (Array.isArray(node)) {
      if (proto !== Array.prototype) throw new Error(`${name}: an array at ${where} has a changed prototype`);
      node.forEach((item, i) => visit(item, `${where}[${i}]`));
      return;
    }
    if (proto !== Object.prototype && proto !== null) throw new Error(`${name}: the object at ${where} got its prototype from the input`);
    for (const [key, item] of Object.entries(node)) visit(item, `${where}.${key}`);
  };
  visit(output, "value");
}

function checkRefused(name: string, error: z.ZodError): void {
  expect(error.issues.length, name).toBeGreaterThan(0);
  for (const issue of error.issues) {
    expect(Array.isArray(issue.path), name).toBe(true);
    for (const key of issue.path) expect(["string", "number"], name).toContain(typeof key);
    expect(typeof issue.message, name).toBe("string");
    const message = issue.message.trim();
    // Readable: words, not a dump of the input or an internal placeholder.
    expect(message.length, `${name}: ${JSON.stringify(issue)}`).toBeGreaterThanOrEqual(5);
    expect(message.length, `${name}: a message of ${message.length} characters`).toBeLessThanOrEqual(300);
    expect(message, name).not.toMatch(/\[object |function \(|=>|received undefined/);
  }
}

function checkParse(name: string, schema: z.ZodType, input: unknown): void {
  let result: ReturnType<z.ZodType["safeParse"]>;
  try {
    result = schema.safeParse(input);
  } catch (error) {
    throw new Error(`${name} threw on ${String(input).slice(0, 80)}: ${String(error)}`);
  }
  expect(({} as Record<string, unknown>).polluted, `${name} polluted Object.prototype`).toBeUndefined();
  if (!result.success) {
    checkRefused(name, result.error);
    return;
  }
  checkAccepted(name, result.data);
  if (name in passedOnUnread) return;
  // What the API sends is JSON: an accepted value survives the round trip and is accepted again.
  const json = JSON.stringify(result.data, (_key, value: unknown) => (typeof value === "bigint" ? String(value) : value));
  if (json === undefined) return;
  const again = schema.safeParse(JSON.parse(json));
  if (!again.success) throw new Error(`${name}: an accepted value fails after a JSON round trip: ${again.error.issues[0]?.message} at ${again.error.issues[0]?.path.join(".")}`);
}

describe("every schema of the contracts", () => {
  it("is found by walking the exports (a sanity check on the walk)", () => {
    const names = schemas.map(([name]) => name);
    expect(names.length).toBeGreaterThan(100);
    for (const known of ["signInInput", "budgetSplitPlanInput", "modelSettingsSchema", "createFlagInput", "apiErrorSchema", "portfolioMapSchema"]) expect(names).toContain(known);
  });

  for (const [name, schema] of schemas) {
    it(`${name}: hostile values, and plausible values with hostile parts, never throw, are refused clearly or accepted safely`, () => {
      fc.assert(
        fc.property(hostileValue, (input) => checkParse(name, schema, input)),
        { seed, numRuns: 40, verbose: 0 },
      );
      fc.assert(
        fc.property(mutated(schema), (input) => checkParse(name, schema, input)),
        { seed, numRuns: 60 },
      );
      // Plausible values alone reach the deepest refinements.
      fc.assert(
        fc.property(plausible(schema), (input) => checkParse(name, schema, input)),
        { seed, numRuns: 30 },
      );
    });
  }
});

describe("zod's own checks speak plain words", () => {
  const messages = (schema: z.ZodType, value: unknown) => (schema.safeParse(value).error?.issues ?? []).map((issue) => `${issue.path.join(".")}: ${issue.message}`);

  it("for missing fields, wrong types, NaN and Infinity, unknown options and sizes", () => {
    expect(messages(contracts.signInInput, { email: 5 })).toEqual(["email: Expected text, got a number", "password: This is required"]);
    expect(messages(contracts.personUpdateInput, { role: "king", marketIds: "all" })).toEqual([
      "role: Use one of: admin, portfolio_lead, analyst, market_manager",
      "marketIds: Expected a list, got text",
    ]);
    expect(messages(contracts.auditLogQuery, { pageSize: Number.NaN })[0]).toBe("pageSize: The page size must be a number");
    expect(messages(contracts.currentUserSchema.shape.name, Number.POSITIVE_INFINITY)).toEqual([": Expected text, got an infinite number"]);
    expect(messages(contracts.drawSummarySchema.shape.mean, Number.NaN)).toEqual([": Expected a number, got a value that is not a number (NaN)"]);
  });

  it("and the schemas' own messages read as sentences", () => {
    expect(messages(contracts.budgetSplitPlanInput, { totalBudget: "lots" })).toContain("totalBudget: Enter the total budget as a number");
    expect(messages(contracts.scenarioPlanInput, { horizon: 2.5 })).toContain("horizon: The horizon must be a whole number of weeks");
  });
});
