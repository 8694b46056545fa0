// Security headers of every response (helmet), with a strict Content-Security-Policy the
// web app is built to pass: scripts and styles only from our own files (no inline code,
// no eval), workers from our own files, images from our files or data: URLs, requests to
// our own API only, no plug-ins, no <base>, never framed by another page.
import { createHash } from "node:crypto";
import type { RequestHandler } from "express";
import helmet from "helmet";
import { emailInlineStyles } from "../mail/messages";

const hashSource = (text: string) => `'sha256-${createHash("sha256").update(text, "utf8").digest("base64")}'`;

export const contentSecurityPolicy = {
  "default-src": ["'self'"],
  "script-src": ["'self'"],
  "script-src-attr": ["'none'"],
  // Charts' styles are applied through the CSSOM (style properties, constructed sheets), which CSP allows.
  "style-src": ["'self'"],
  // The Outbox's srcdoc frame inherits this policy: exactly the e-mails' own style attributes, by hash; no other.
  "style-src-attr": ["'unsafe-hashes'", ...Object.values(emailInlineStyles).map(hashSource)],
  "img-src": ["'self'", "data:"],
  "font-src": ["'self'"],
  "connect-src": ["'self'"],
  // The planning and prior-check workers are files of the build (new Worker(new URL(…))).
  "worker-src": ["'self'"],
  // The Outbox shows an e-mail in a sandboxed srcdoc frame; nothing else is framed.
  "frame-src": ["'self'"],
  "object-src": ["'none'"],
  "base-uri": ["'none'"],
  "form-action": ["'self'"],
  "frame-ancestors": ["'none'"],
  "manifest-src": ["'self'"],
};

/** The policy as one header value (tests compare against it). */
export function contentSecurityPolicyHeader(): string {
  return Object.entries(contentSecurityPolicy)
    .map(([name, values]) => `${name} ${values.join(" ")}`)
    .join(";");
}

export function securityHeaders(): RequestHandler {
  const directives = Object.fromEntries(Object.entries(contentSecurityPolicy).map(([name, values]) => [name, [...values]]));
  return helmet({
    // Local http must keep working, so no forced upgrade to https.
    contentSecurityPolicy: { useDefaults: false, directives },
    xFrameOptions: { action: "deny" },
  });
}
