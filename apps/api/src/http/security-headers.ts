// Security headers of every response (helmet), with a strict Content-Security-Policy the
// web app is built to pass: scripts and styles only from our own files (no inline code,
// no eval), workers from our own files, images from our files or data: URLs, requests to
// our own API only, no plug-ins, no <base>, never framed by another page.
import type { RequestHandler } from "express";
import helmet from "helmet";

export const contentSecurityPolicy = {
  "default-src": ["'self'"],
  "script-src": ["'self'"],
  "script-src-attr": ["'none'"],
  // Charts' styles are applied through the CSSOM (style properties, constructed sheets), which CSP allows.
  "style-src": ["'self'"],
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
} as const;

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
