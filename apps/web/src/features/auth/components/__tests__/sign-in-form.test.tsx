import { fireEvent, screen, waitFor } from "@testing-library/react";
import { describe, expect, it, vi } from "vitest";
import { jsonResponse, renderWithProviders, stubFetch, testUsers } from "../../../../testing/test-utils";
import { SignInForm } from "../sign-in-form";

function fill(label: string, value: string) {
  fireEvent.change(screen.getByLabelText(label), { target: { value } });
}

function submit() {
  fireEvent.click(screen.getByRole("button", { name: "Sign in" }));
}

describe("sign-in form", () => {
  it("says what is missing when submitted empty, without calling the server", async () => {
    const { calls } = stubFetch({});
    renderWithProviders(<SignInForm onSuccess={vi.fn()} />);
    submit();
    expect(await screen.findByText("Enter a valid e-mail address")).toBeTruthy();
    expect(screen.getByText("Enter your password")).toBeTruthy();
    expect(screen.getByLabelText("E-mail").getAttribute("aria-invalid")).toBe("true");
    expect(screen.getByLabelText("E-mail").getAttribute("aria-describedby")).toBe("sign-in-email-error");
    expect(calls).toHaveLength(0);
  });

  it("rejects an address that is not an e-mail address", async () => {
    stubFetch({});
    renderWithProviders(<SignInForm onSuccess={vi.fn()} />);
    fill("E-mail", "not-an-address");
    fill("Password", "secret");
    submit();
    expect(await screen.findByText("Enter a valid e-mail address")).toBeTruthy();
    expect(screen.queryByText("Enter your password")).toBeNull();
  });

  it("sends the cleaned-up address and hands the signed-in user on", async () => {
    const { calls } = stubFetch({ "POST /api/auth/sign-in": () => jsonResponse(200, testUsers.analyst) });
    const onSuccess = vi.fn();
    renderWithProviders(<SignInForm onSuccess={onSuccess} />);
    fill("E-mail", "  Analyst@Tallowmere.TEST ");
    fill("Password", "a password");
    submit();
    await waitFor(() => expect(onSuccess).toHaveBeenCalledWith(testUsers.analyst));
    expect(calls[0]?.body).toEqual({ email: "analyst@tallowmere.test", password: "a password" });
  });

  it("says plainly when the e-mail and password do not match", async () => {
    stubFetch({
      "POST /api/auth/sign-in": () => jsonResponse(401, { error: { code: "unauthenticated", message: "Invalid credentials" } }),
    });
    const onSuccess = vi.fn();
    renderWithProviders(<SignInForm onSuccess={onSuccess} />);
    fill("E-mail", "someone@tallowmere.test");
    fill("Password", "wrong");
    submit();
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toMatch(/do not match an account/);
    expect(onSuccess).not.toHaveBeenCalled();
  });

  it("puts the server's field messages next to the fields", async () => {
    stubFetch({
      "POST /api/auth/sign-in": () =>
        jsonResponse(400, {
          error: {
            code: "invalid_input",
            message: "Check the highlighted fields.",
            issues: [{ path: "email", message: "This address is not allowed here" }],
          },
        }),
    });
    renderWithProviders(<SignInForm onSuccess={vi.fn()} />);
    fill("E-mail", "someone@tallowmere.test");
    fill("Password", "pw");
    submit();
    expect(await screen.findByText("This address is not allowed here")).toBeTruthy();
    expect(screen.getByRole("alert").textContent).toBe("Check the highlighted fields.");
  });

  it("passes on the server's message when sign-in is rate limited", async () => {
    stubFetch({
      "POST /api/auth/sign-in": () =>
        jsonResponse(429, { error: { code: "rate_limited", message: "Too many attempts. Try again in 15 minutes." } }),
    });
    renderWithProviders(<SignInForm onSuccess={vi.fn()} />);
    fill("E-mail", "someone@tallowmere.test");
    fill("Password", "pw");
    submit();
    expect((await screen.findByRole("alert")).textContent).toBe("Too many attempts. Try again in 15 minutes.");
  });
});
