import { mailKindLabels, type OutboxMessage } from "@tributary/contracts";
import { useId, useState, type ReactNode } from "react";
import { Button } from "../../../components/ui/button";
import { formatDateTime } from "../../../lib/format";

/**
 * A policy for the message's own document: nothing may load or run (inline styles and
 * embedded images excepted), on top of the frame's sandbox.
 */
export const MESSAGE_CONTENT_POLICY = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; font-src data:";

/** The message's HTML with the content policy placed first in its head. */
export function withContentPolicy(html: string): string {
  const meta = `<meta http-equiv="Content-Security-Policy" content="${MESSAGE_CONTENT_POLICY}">`;
  const head = /<head(\s[^>]*)?>/i.exec(html);
  if (head) return html.slice(0, head.index + head[0].length) + meta + html.slice(head.index + head[0].length);
  const root = /<html(\s[^>]*)?>/i.exec(html);
  if (root) return `${html.slice(0, root.index + root[0].length)}<head>${meta}</head>${html.slice(root.index + root[0].length)}`;
  return `<!doctype html><html><head>${meta}</head><body>${html}</body></html>`;
}

const urlPattern = /https?:\/\/[^\s<>"')\]]+/g;

/** Plain text with its web addresses as links that open apart from the app. */
export function linkedText(text: string): ReactNode[] {
  const parts: ReactNode[] = [];
  let last = 0;
  for (const match of text.matchAll(urlPattern)) {
    const start = match.index;
    // A full stop or comma after an address ends the sentence, not the address.
    const url = match[0].replace(/[.,;:!?]+$/, "");
    if (start > last) parts.push(text.slice(last, start));
    parts.push(
      <a key={start} href={url} target="_blank" rel="noopener noreferrer" className="break-all text-stream-700 underline">
        {url}
      </a>,
    );
    last = start + url.length;
  }
  if (last < text.length) parts.push(text.slice(last));
  return parts;
}

/** One e-mail as its recipient reads it: the HTML in a sandboxed frame (no scripts, no loads), or the text. */
export function MessageReader({ message, onClose }: { message: OutboxMessage; onClose?: () => void }) {
  const id = useId();
  const [view, setView] = useState<"html" | "text">(message.html ? "html" : "text");
  const label = (mailKindLabels as Record<string, string>)[message.kind] ?? message.kind;
  return (
    <article aria-labelledby={`${id}-subject`} className="rounded-lg border border-line bg-surface shadow-card">
      <header className="flex flex-wrap items-start justify-between gap-3 border-b border-line px-5 py-4">
        <div>
          <h2 id={`${id}-subject`} className="text-heading font-semibold text-ink-900">
            {message.subject}
          </h2>
          <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 text-small text-ink-700">
            <dt>To</dt>
            <dd>
              {message.to}
              {message.toUser ? ` (${message.toUser.name})` : ""}
            </dd>
            <dt>Sent</dt>
            <dd>{formatDateTime(message.createdAt)}</dd>
            <dt>Kind</dt>
            <dd>{label}</dd>
          </dl>
        </div>
        <div className="flex items-center gap-2">
          <div role="group" aria-label="Version to read" className="inline-flex rounded-md border border-field">
            <button
              type="button"
              aria-pressed={view === "html"}
              disabled={!message.html}
              onClick={() => setView("html")}
              className={`rounded-l-md px-3 py-1.5 text-small ${view === "html" ? "bg-stream-700 text-white" : "text-ink-800 hover:bg-ink-50"} disabled:text-ink-400`}
            >
              As sent
            </button>
            <button
              type="button"
              aria-pressed={view === "text"}
              onClick={() => setView("text")}
              className={`rounded-r-md px-3 py-1.5 text-small ${view === "text" ? "bg-stream-700 text-white" : "text-ink-800 hover:bg-ink-50"}`}
            >
              Plain text
            </button>
          </div>
          {onClose ? (
            <Button variant="quiet" onClick={onClose}>
              Close
            </Button>
          ) : null}
        </div>
      </header>
      <div className="p-5">
        {view === "html" && message.html ? (
          <>
            <iframe
              title={`Message as sent: ${message.subject}`}
              // An empty sandbox: no scripts, no forms, no pop-ups, no access to the app's origin.
              sandbox=""
              referrerPolicy="no-referrer"
              srcDoc={withContentPolicy(message.html)}
              className="h-[28rem] w-full rounded-md border border-line bg-white"
            />
            <p className="mt-2 text-caption text-ink-600">Shown in a locked frame: scripts, forms and outside images do not run or load. Links work in the plain-text version.</p>
          </>
        ) : (
          <pre aria-label="Plain-text version" className="whitespace-pre-wrap break-words font-sans text-body text-ink-900">
            {linkedText(message.text)}
          </pre>
        )}
        {!message.html ? <p className="mt-2 text-caption text-ink-600">This message was sent as plain text only.</p> : null}
      </div>
    </article>
  );
}
