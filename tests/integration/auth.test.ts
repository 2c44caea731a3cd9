import { describe, expect, it } from "vitest";
import { firstLink, waitForMail } from "../support/mail";
import { BASE_URL, confirmEmail, pageText, signUp, uniqueEmail, Visitor } from "../support/http";

describe("accounts: sign-up, sign-in, sign-out, password reset", () => {
  it("signs up a new engineer, who lands on 'start a team' with a session", async () => {
    const { visitor } = await signUp("newcomer");
    const page = await visitor.get("/teams/new");
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("You are not in a team yet");
  });

  it("answers sign-up the same for a taken address, signs nobody in, and mails the owner instead", async () => {
    const { email } = await signUp("twice");
    const fresh = uniqueEmail("fresh");
    const answers = [];
    for (const address of [email, fresh]) {
      const response = await new Visitor().postForm("/sign-up", { name: "Again", email: address, password: "another-long-password", next: "" });
      answers.push({ status: response.status, cookies: response.headers.getSetCookie(), page: (await pageText(response)).replaceAll(address, "ADDRESS").replace(/nonce="[^"]*"/g, 'nonce=""') });
    }
    expect(answers[0]).toEqual(answers[1]);
    expect(answers[0]!.status).toBe(200);
    expect(answers[0]!.cookies).toEqual([]);
    expect(answers[0]!.page).toContain("We sent a message to ADDRESS");
    expect(answers[0]!.page).not.toMatch(/already exists|already has/i);
    // The owner learns of the attempt; the new address gets its confirmation link.
    const note = await waitForMail(email, /tried to create a Sinewright account/);
    expect(note.text).toContain("/forgot-password");
    const confirm = await waitForMail(fresh, /Confirm your e-mail address/);
    expect(firstLink(confirm.text)).toContain("/api/auth/verify-email?token=");
    // The second password did not replace the first.
    expect((await new Visitor().postForm("/sign-in", { email, password: "another-long-password", next: "" })).status).toBe(400);
  });

  it("signs a new account in from its confirmation link, and continues to where it was going", async () => {
    const email = uniqueEmail("confirming");
    const visitor = new Visitor();
    await visitor.postForm("/sign-up", { name: "Confirming", email, password: "correct-horse-battery", next: "/teams/new" });
    expect((await visitor.get("/teams/new")).status).toBe(302);
    expect(await confirmEmail(visitor, email)).toBe("/teams/new");
    expect((await visitor.get("/teams/new")).status).toBe(200);
  });

  it("explains bad sign-up input field by field, and creates nothing", async () => {
    const email = uniqueEmail("short");
    const response = await new Visitor().postForm("/sign-up", { name: "", email, password: "short", next: "" });
    expect(response.status).toBe(400);
    const html = await response.text();
    expect(html).toContain("Enter your name");
    expect(html).toContain("at least 10 characters");
    const signIn = await new Visitor().postForm("/sign-in", { email, password: "short", next: "" });
    expect(signIn.status).toBe(400);
  });

  it("signs in, reaches the app, signs out and is sent back to sign-in", async () => {
    const visitor = await new Visitor().signIn("engineer@example.com");
    const sheets = await visitor.get("/sheets");
    expect(sheets.status).toBe(200);
    expect(await sheets.text()).toContain("Larkfield Power Systems");
    const out = await visitor.postForm("/sign-out", {});
    expect(out.status).toBe(302);
    const after = await visitor.get("/sheets");
    expect(after.status).toBe(302);
    expect(after.headers.get("location")).toMatch(/^\/sign-in\?next=%2Fsheets/);
  });

  it("answers a wrong password with a clear message and no session", async () => {
    const visitor = new Visitor();
    const response = await visitor.postForm("/sign-in", { email: "engineer@example.com", password: "not-the-password", next: "" });
    expect(response.status).toBe(400);
    expect(await response.text()).toContain("That e-mail and password do not match an account");
    expect((await visitor.get("/sheets")).status).toBe(302);
  });

  it("resets a password through the e-mailed link", async () => {
    const { email, password } = await signUp("forgetful");
    const request = await new Visitor().postForm("/forgot-password", { email });
    expect(request.status).toBe(200);
    const mail = await waitForMail(email, /Reset your Sinewright password/);
    const link = firstLink(mail.text);
    expect(link.startsWith(BASE_URL)).toBe(true);

    const visitor = new Visitor();
    const follow = await visitor.get(link);
    expect(follow.status).toBe(302);
    const target = new URL(follow.headers.get("location")!, BASE_URL);
    expect(target.pathname).toBe("/reset-password");
    const token = target.searchParams.get("token")!;
    expect(token).toBeTruthy();

    const mismatch = await visitor.postForm("/reset-password", { token, password: "brand-new-password", confirm: "different-password" });
    expect(mismatch.status).toBe(400);
    expect(await mismatch.text()).toContain("The two passwords differ");

    const reset = await visitor.postForm("/reset-password", { token, password: "brand-new-password", confirm: "brand-new-password" });
    expect(reset.status).toBe(302);
    expect(reset.headers.get("location")).toBe("/sign-in?reset=done");

    const oldPassword = await new Visitor().postForm("/sign-in", { email, password, next: "" });
    expect(oldPassword.status).toBe(400);
    await new Visitor().signIn(email, "brand-new-password");

    const reused = await visitor.postForm("/reset-password", { token, password: "third-password-xyz", confirm: "third-password-xyz" });
    expect(reused.status).toBe(400);
    expect(await reused.text()).toContain("expired or was already used");
  });

  it("gives the same answer for an unknown address, so nobody learns who has an account", async () => {
    const response = await new Visitor().postForm("/forgot-password", { email: uniqueEmail("nobody") });
    expect(response.status).toBe(200);
    expect(await response.text()).toContain("If an account uses that address");
  });

  it("refuses a cross-site form post", async () => {
    const response = await new Visitor().postForm(
      "/sign-in",
      { email: "engineer@example.com", password: "sinewright-demo", next: "" },
      { origin: "https://evil.example" },
    );
    // Refused by the framework's own origin check (400) or ours (403); either way no session.
    expect([400, 403]).toContain(response.status);
    expect(response.headers.getSetCookie()).toEqual([]);
  });

  it("only follows same-site paths after sign-in", async () => {
    const response = await new Visitor().postForm("/sign-in", { email: "viewer@example.com", password: "sinewright-demo", next: "//evil.example/x" });
    expect(response.status).toBe(302);
    expect(response.headers.get("location")).toBe("/sheets");
  });

  it("sends a signed-in visitor only to same-origin paths written plainly (tab, newline, slashes, backslashes refused)", async () => {
    const visitor = await new Visitor().signIn("viewer@example.com");
    for (const next of ["/%09/evil.example", "/%0A/evil.example", "//evil.example", "/%5Cevil.example", "%5C/evil.example", "/%252F%252Fevil.example", "javascript:alert(1)", "https://evil.example"]) {
      const response = await visitor.get(`/sign-in?next=${next}`);
      expect(response.status, next).toBe(302);
      expect(response.headers.get("location"), next).toBe("/sheets");
    }
    // As the sign-in redirect writes it: the path and its (already encoded) query, encoded once more.
    const fine = await visitor.get(`/sign-in?next=${encodeURIComponent("/search?q=dead%20time")}`);
    expect(fine.headers.get("location")).toBe("/search?q=dead%20time");
  });

  it("answers /healthz with the database reachable", async () => {
    const response = await fetch(new URL("/healthz", BASE_URL));
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ status: "ok", database: "reachable" });
  });
});
