import { fireEvent, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { createApiFake, problem } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";

const TOKEN = "tok.en-1234567890";
const LINK_PATH = `/api/password-links/${encodeURIComponent(TOKEN)}`;
const USED = problem(410, "link-not-valid", "This link has already been used. Ask for a new one.");
const INVITE = { purpose: "invite", name: "Pat Propagator", email: "pat@nursery.test", expiresAtMs: Date.UTC(2030, 0, 1) };

describe("set-password page", () => {
  it(
    "a used or expired link says so, offers a new one, and shows no form",
    async () => {
      const api = createApiFake({ [`GET ${LINK_PATH}`]: USED });
      renderApp(`/set-password?token=${encodeURIComponent(TOKEN)}`, api);

      const alert = await screen.findByRole("alert", {}, FIRST_PAINT);
      expect(alert.textContent).toContain("This link can't be used");
      expect(alert.textContent).toContain("already been used");
      expect(screen.getByRole("link", { name: "Ask for a new link" }).getAttribute("href")).toBe("/reset-password");
      expect(screen.queryByLabelText("New password")).toBeNull();
      // Opening the page only read the link.
      expect(api.requests.map((r) => r.method)).toEqual(["GET"]);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "shows whose link it is, checks the two passwords with the shared schema, then sets it and links to sign-in",
    async () => {
      const api = createApiFake({ [`GET ${LINK_PATH}`]: { body: INVITE }, [`POST ${LINK_PATH}`]: { body: { email: INVITE.email } } });
      renderApp(`/set-password?token=${encodeURIComponent(TOKEN)}`, api);

      const form = await screen.findByRole("form", { name: "Set your password" }, FIRST_PAINT);
      expect(form.textContent).toContain("Welcome, Pat Propagator");
      expect(form.textContent).toContain("pat@nursery.test");

      fireEvent.change(within(form).getByLabelText("New password"), { target: { value: "short" } });
      fireEvent.click(within(form).getByRole("button", { name: "Set password" }));
      expect(await within(form).findByText("Use at least 10 characters")).toBeTruthy();

      fireEvent.change(within(form).getByLabelText("New password"), { target: { value: "warm benches all night" } });
      fireEvent.change(within(form).getByLabelText("New password again"), { target: { value: "warm benches all day" } });
      fireEvent.click(within(form).getByRole("button", { name: "Set password" }));
      expect(await within(form).findByText("The two passwords differ")).toBeTruthy();
      expect(api.sent(`POST ${LINK_PATH}`)).toHaveLength(0);

      fireEvent.change(within(form).getByLabelText("New password again"), { target: { value: "warm benches all night" } });
      fireEvent.click(within(form).getByRole("button", { name: "Set password" }));
      expect(await screen.findByText("Password set")).toBeTruthy();
      expect(api.sent(`POST ${LINK_PATH}`)[0]?.body).toEqual({ password: "warm benches all night", confirm: "warm benches all night" });
      expect(screen.getByRole("link", { name: "Sign in" }).getAttribute("href")).toBe("/sign-in?email=pat%40nursery.test");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a link used up in another tab meanwhile (410 on saving) gets the same clear message",
    async () => {
      const api = createApiFake({ [`GET ${LINK_PATH}`]: { body: { ...INVITE, purpose: "reset" } }, [`POST ${LINK_PATH}`]: USED });
      renderApp(`/set-password?token=${encodeURIComponent(TOKEN)}`, api);
      const form = await screen.findByRole("form", { name: "Set your password" }, FIRST_PAINT);
      expect(form.textContent).toContain("Choose a new password for Pat Propagator");
      fireEvent.change(within(form).getByLabelText("New password"), { target: { value: "warm benches all night" } });
      fireEvent.change(within(form).getByLabelText("New password again"), { target: { value: "warm benches all night" } });
      fireEvent.click(within(form).getByRole("button", { name: "Set password" }));
      expect((await screen.findByRole("alert")).textContent).toContain("This link can't be used");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "an address without a token says what is wrong",
    async () => {
      renderApp("/set-password", createApiFake({}));
      expect((await screen.findByRole("alert", {}, FIRST_PAINT)).textContent).toContain("missing the part that identifies the link");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});

describe("request a reset link", () => {
  it(
    "sends the address and answers the same way whether or not it has an account",
    async () => {
      const api = createApiFake({ "POST /api/password-resets": { status: 202, body: { detail: "If that address has an account…" } } });
      renderApp("/reset-password", api);
      const form = await screen.findByRole("form", { name: "Ask for a reset link" }, FIRST_PAINT);
      fireEvent.change(within(form).getByLabelText("E-mail"), { target: { value: "Nobody@Nursery.test" } });
      fireEvent.click(within(form).getByRole("button", { name: "Send the link" }));
      expect((await screen.findByRole("status")).textContent).toContain("If nobody@nursery.test has a Benchwarden account");
      expect(api.sent("POST /api/password-resets")[0]?.body).toEqual({ email: "nobody@nursery.test" });
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
