import type { OutboxMessage, OutboxPage } from "@tributary/contracts";
import { fireEvent, render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { jsonResponse, renderWithProviders, stubFetch } from "../../../../testing/test-utils";
import { MESSAGE_CONTENT_POLICY, MessageReader, withContentPolicy } from "../message-reader";
import { Outbox } from "../outbox";

const hostile = `<!doctype html><html><head><title>x</title></head><body><h1>You are invited</h1><script>window.parent.document.body.dataset.pwned = "yes"</script><img src="https://tracker.example/pixel.gif" onerror="alert(1)"><a href="http://127.0.0.1/invite/tok-123">Accept</a></body></html>`;

const message: OutboxMessage = {
  id: "mail-1",
  to: "nell.ostrand@tallowmere.test",
  toUser: null,
  subject: "You are invited to Tributary",
  kind: "invitation",
  createdAt: "2025-01-08T09:00:00.000Z",
  text: "Ada Quern invited you.\n\nAccept here: http://127.0.0.1/invite/tok-123.\nThe link works for 72 hours.",
  html: hostile,
};

describe("the message reader", () => {
  it("shows the HTML only inside an empty sandbox, with a policy that loads and runs nothing", () => {
    render(<MessageReader message={message} />);
    const frame = screen.getByTitle("Message as sent: You are invited to Tributary") as HTMLIFrameElement;
    expect(frame.tagName).toBe("IFRAME");
    // An empty sandbox attribute: no allow-scripts, no allow-same-origin, no allow-popups.
    expect(frame.getAttribute("sandbox")).toBe("");
    const srcdoc = frame.getAttribute("srcdoc") ?? "";
    expect(srcdoc).toContain(`<meta http-equiv="Content-Security-Policy" content="${MESSAGE_CONTENT_POLICY}">`);
    expect(srcdoc.indexOf("Content-Security-Policy")).toBeLessThan(srcdoc.indexOf("<script>"));
    // The message never becomes part of the app's own page.
    expect(document.querySelector("script")).toBeNull();
    expect(document.querySelector('img[src^="https://tracker"]')).toBeNull();
    expect(document.body.dataset.pwned).toBeUndefined();
    expect(screen.queryByRole("heading", { name: "You are invited" })).toBeNull();
  });

  it("shows the plain text with its links", () => {
    render(<MessageReader message={message} />);
    fireEvent.click(screen.getByRole("button", { name: "Plain text" }));
    const text = screen.getByLabelText("Plain-text version");
    expect(text.textContent).toBe(message.text);
    const link = within(text).getByRole("link", { name: "http://127.0.0.1/invite/tok-123" });
    // The sentence's full stop is not part of the address; the link opens apart from the app.
    expect(link.getAttribute("href")).toBe("http://127.0.0.1/invite/tok-123");
    expect(link.getAttribute("rel")).toBe("noopener noreferrer");
  });

  it("puts the policy first in whatever shape of HTML it gets", () => {
    expect(withContentPolicy("<p>Hi</p>")).toBe(`<!doctype html><html><head><meta http-equiv="Content-Security-Policy" content="${MESSAGE_CONTENT_POLICY}"></head><body><p>Hi</p></body></html>`);
    expect(withContentPolicy('<html lang="en"><body>Hi</body></html>')).toMatch(/^<html lang="en"><head><meta http-equiv="Content-Security-Policy"/);
    expect(withContentPolicy("<HTML><HEAD><TITLE>t</TITLE></HEAD></HTML>")).toMatch(/^<HTML><HEAD><meta http-equiv/);
  });

  it("reads a text-only message as text", () => {
    render(<MessageReader message={{ ...message, html: null }} />);
    expect(screen.queryByTitle(/Message as sent/)).toBeNull();
    expect(screen.getByText("This message was sent as plain text only.")).toBeTruthy();
  });
});

describe("Outbox", () => {
  it("lists the messages, filters them on the server and opens one", async () => {
    const page = (messages: OutboxPage["messages"]): OutboxPage => ({ messages, total: messages.length, page: 1, pageSize: 25 });
    const { fetchMock } = stubFetch({
      "GET /api/outbox": () => jsonResponse(200, page([{ id: message.id, to: message.to, toUser: null, subject: message.subject, kind: message.kind, createdAt: message.createdAt }, { id: "mail-2", to: "mika.dorne@tallowmere.test", toUser: { id: "u-m", name: "Mika Dorne" }, subject: "A new fit is published", kind: "run_published", createdAt: "2025-01-07T08:00:00.000Z" }])),
      "GET /api/outbox/mail-1": () => jsonResponse(200, message),
    });
    renderWithProviders(<Outbox />);
    const table = await screen.findByRole("table", { name: /Messages sent/ });
    expect(within(table).getAllByRole("row")).toHaveLength(3);
    expect(within(table).getByRole("row", { name: /mika.dorne@tallowmere.test \(Mika Dorne\)/ }).textContent).toMatch(/New fit published/);

    fireEvent.change(screen.getByLabelText("Kind"), { target: { value: "invitation" } });
    fireEvent.change(screen.getByLabelText("Recipient contains"), { target: { value: "nell" } });
    fireEvent.click(screen.getByRole("button", { name: "Filter" }));
    await screen.findByRole("button", { name: "Show every message" });
    const urls = fetchMock.mock.calls.map(([url]) => String(url));
    expect(urls).toContain("/api/outbox?page=1&pageSize=25&kind=invitation&to=nell");

    fireEvent.click(within(table).getByRole("button", { name: "Read “You are invited to Tributary” to nell.ostrand@tallowmere.test" }));
    const reader = await screen.findByRole("article", { name: "You are invited to Tributary" });
    expect(within(reader).getByTitle("Message as sent: You are invited to Tributary").getAttribute("sandbox")).toBe("");
  });

  it("says so when nothing was sent yet", async () => {
    stubFetch({ "GET /api/outbox": () => jsonResponse(200, { messages: [], total: 0, page: 1, pageSize: 25 }) });
    renderWithProviders(<Outbox />);
    expect(await screen.findByRole("heading", { name: "No e-mails sent yet" })).toBeTruthy();
  });
});
