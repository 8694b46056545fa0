// Plain-words messages for zod's own checks, wherever a schema does not give its own
// (a schema's message always wins). They reach people through the API's error shape and
// the web app's forms, so they say what to send, not how the parser sees it.
import { z } from "zod";

const typeWords: Record<string, string> = {
  string: "text",
  number: "a number",
  int: "a whole number",
  boolean: "true or false",
  object: "a group of fields (an object)",
  array: "a list",
  date: "a date",
  bigint: "a whole number",
  null: "nothing (null)",
};

/** What was sent, in a few words (never the value itself, which may be long or private). */
export function describeReceived(input: unknown): string {
  if (input === undefined) return "nothing";
  if (input === null) return "null";
  if (typeof input === "number") return Number.isNaN(input) ? "a value that is not a number (NaN)" : Number.isFinite(input) ? "a number" : "an infinite number";
  if (typeof input === "string") return input === "" ? "empty text" : "text";
  if (typeof input === "boolean") return "true or false";
  if (typeof input === "bigint") return "a big integer";
  if (Array.isArray(input)) return "a list";
  if (typeof input === "object") return "a group of fields (an object)";
  return `a ${typeof input}`;
}

const listOf = (values: readonly unknown[]) => {
  const shown = values.slice(0, 10).map((value) => (typeof value === "string" ? value : JSON.stringify(value)));
  return `${shown.join(", ")}${values.length > 10 ? ", …" : ""}`;
};

const sizeWords = (origin: string, amount: number | bigint) => {
  if (origin === "string") return `${amount} character${amount === 1 ? "" : "s"}`;
  if (origin === "array" || origin === "set") return `${amount} item${amount === 1 ? "" : "s"}`;
  return String(amount);
};

function message(issue: z.core.$ZodRawIssue): string | undefined {
  switch (issue.code) {
    case "invalid_type": {
      if (issue.input === undefined) return "This is required";
      if (issue.expected === "nonoptional") return "This is required";
      const expected = typeWords[issue.expected] ?? issue.expected;
      return `Expected ${expected}, got ${describeReceived(issue.input)}`;
    }
    case "invalid_value":
      return issue.values.length === 1 ? `Use ${listOf(issue.values)}` : `Use one of: ${listOf(issue.values)}`;
    case "too_small": {
      const origin = String(issue.origin ?? "");
      if (origin === "string" || origin === "array" || origin === "set") {
        if (Number(issue.minimum) === 1 && origin === "string") return "This cannot be empty";
        if (Number(issue.minimum) === 1) return "Give at least one item";
        return `Use at least ${sizeWords(origin, issue.minimum)}`;
      }
      return issue.inclusive ? `Must be at least ${issue.minimum}` : `Must be greater than ${issue.minimum}`;
    }
    case "too_big": {
      const origin = String(issue.origin ?? "");
      if (origin === "string" || origin === "array" || origin === "set") return `Use at most ${sizeWords(origin, issue.maximum)}`;
      return issue.inclusive ? `Must be at most ${issue.maximum}` : `Must be less than ${issue.maximum}`;
    }
    case "invalid_format":
      return issue.format === "email" ? "Enter a valid e-mail address" : `Not a valid ${issue.format}`;
    case "not_multiple_of":
      return `Must be a multiple of ${issue.divisor}`;
    case "unrecognized_keys":
      return `Unknown field${issue.keys.length === 1 ? "" : "s"}: ${listOf(issue.keys)}`;
    case "invalid_union":
      return "This does not match any of the accepted forms";
    case "invalid_key":
      return "A key of this group is not valid";
    case "invalid_element":
      return "An item of this list is not valid";
    default:
      return undefined;
  }
}

z.config({ customError: message });
