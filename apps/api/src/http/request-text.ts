// Text a request may not carry: the NUL character (Postgres text cannot store it, so a
// query holding one fails) and lone UTF-16 surrogates (not Unicode; they would be stored
// as U+FFFD, silently changed). Refused before any handler reads the request: in the
// path, the query string and the JSON body (keys included).
import type { Request, RequestHandler } from "express";
import { Invalid, NotFound } from "./errors";

const unstorable = /\u0000|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** The first place in a value holding unstorable text, as a path ("" for the value itself), or null. */
export function unstorableTextAt(value: unknown, path = "", depth = 0): string | null {
  if (typeof value === "string") return unstorable.test(value) ? path || "value" : null;
  if (value === null || typeof value !== "object" || depth > 64) return null;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const found = unstorableTextAt(value[i], path ? `${path}.${i}` : String(i), depth + 1);
      if (found !== null) return found;
    }
    return null;
  }
  for (const [key, item] of Object.entries(value)) {
    const at = path ? `${path}.${key}` : key;
    if (unstorable.test(key)) return at;
    const found = unstorableTextAt(item, at, depth + 1);
    if (found !== null) return found;
  }
  return null;
}

const words = "contains a character that cannot be stored (a NUL character or a broken Unicode surrogate)";

/** For the query string and JSON body (after express.json). */
export const refuseUnstorableText: RequestHandler = (req, _res, next) => {
  const inQuery = unstorableTextAt(req.query);
  if (inQuery !== null) throw new Invalid(`The query parameter ${inQuery} ${words}`, [{ path: inQuery, message: `This ${words}` }]);
  const inBody = unstorableTextAt(req.body);
  if (inBody !== null) throw new Invalid(`The field ${inBody} ${words}`, [{ path: inBody, message: `This ${words}` }]);
  next();
};

/** For path parameters (known only once a route matched): nothing with such a name exists. */
export function checkPathText(req: Request): void {
  if (unstorableTextAt(req.params) !== null) throw new NotFound();
}
