import { QueryClientProvider } from "@tanstack/react-query";
import { fireEvent, render, screen, waitFor } from "@testing-library/react";
import { MemoryRouter } from "react-router-dom";
import { describe, expect, it, vi } from "vitest";
import { createQueryClient } from "../../../lib/query-client";
import { USERS, makeSession } from "../../../testing/data";
import { createApiFake, problem } from "../../../testing/fakes";
import { SignInForm } from "./sign-in-form";

function renderForm(api: ReturnType<typeof createApiFake>) {
  vi.stubGlobal("fetch", api.fetch);
  const onSignedIn = vi.fn();
  render(
    <QueryClientProvider client={createQueryClient()}>
      <MemoryRouter>
        <SignInForm onSignedIn={onSignedIn} />
      </MemoryRouter>
    </QueryClientProvider>,
  );
  return { onSignedIn };
}

const email = () => screen.getByLabelText("E-mail") as HTMLInputElement;
const password = () => screen.getByLabelText("Password") as HTMLInputElement;
const submit = () => fireEvent.click(screen.getByRole("button", { name: "Sign in" }));

function fillIn(emailText: string, passwordText: string) {
  fireEvent.change(email(), { target: { value: emailText } });
  fireEvent.change(password(), { target: { value: passwordText } });
}

describe("SignInForm", () => {
  it("checks the fields with the shared sign-in schema and sends nothing while they are invalid", async () => {
    const api = createApiFake({});
    renderForm(api);

    submit();
    expect(await screen.findByText("Enter a valid e-mail address")).toBeTruthy();
    expect(screen.getByText("Enter your password")).toBeTruthy();
    expect(email().getAttribute("aria-invalid")).toBe("true");
    expect(email().getAttribute("aria-describedby")).toContain("-error");

    fillIn("not-an-address", "x");
    submit();
    expect(await screen.findByText("Enter a valid e-mail address")).toBeTruthy();
    expect(screen.queryByText("Enter your password")).toBeNull();
    expect(api.requests).toHaveLength(0);
  });

  it("sends the address as the schema normalises it and hands over the session", async () => {
    const session = makeSession(USERS.grower);
    const api = createApiFake({ "POST /api/session": { body: session } });
    const { onSignedIn } = renderForm(api);

    fillIn("  Grower@Nursery.TEST ", "bench-demo-2026");
    submit();

    await waitFor(() => expect(onSignedIn).toHaveBeenCalledWith(session));
    expect(api.sent("POST /api/session")[0]?.body).toEqual({ email: "grower@nursery.test", password: "bench-demo-2026" });
  });

  it("shows the server's words for a wrong password (401) and clears the password", async () => {
    const api = createApiFake({
      "POST /api/session": problem(401, "invalid-credentials", "That e-mail and password do not match an active account"),
    });
    renderForm(api);

    fillIn("grower@nursery.test", "wrong-password");
    submit();

    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("That e-mail and password do not match an active account");
    expect(password().value).toBe("");
    expect(email().value).toBe("grower@nursery.test");
  });

  it("shows the server's plain message when sign-ins are rate limited (429)", async () => {
    const detail = "Too many failed sign-ins. Try again in 14 minutes, or reset your password.";
    const api = createApiFake({ "POST /api/session": problem(429, "too-many-sign-in-attempts", detail) });
    renderForm(api);

    fillIn("grower@nursery.test", "another-guess");
    submit();

    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("Too many tries");
    expect(alert.textContent).toContain(detail);
    expect(screen.getByRole("link", { name: "Forgot your password?" }).getAttribute("href")).toBe("/reset-password");
  });
});
