/**
 * A minimal cookie-keeping HTTP client for testing the running server the way a
 * browser without JavaScript would: form posts with our Origin, redirects not followed.
 */
export const BASE_URL = process.env.SINEWRIGHT_TEST_URL ?? "http://localhost:3000";

export class Visitor {
  private cookies = new Map<string, string>();

  /** `baseUrl` is the shared test server unless a test started its own (tests/support/own-server.ts). */
  constructor(readonly baseUrl = BASE_URL) {}

  cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
  }

  private remember(response: Response) {
    for (const line of response.headers.getSetCookie()) {
      const [pair] = line.split(";");
      const eq = pair!.indexOf("=");
      const key = pair!.slice(0, eq).trim();
      const value = pair!.slice(eq + 1).trim();
      if (/max-age=0/i.test(line) || value === "") this.cookies.delete(key);
      else this.cookies.set(key, value);
    }
  }

  async request(path: string, init: RequestInit = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    if (this.cookies.size > 0) headers.set("cookie", this.cookieHeader());
    if (init.method && init.method !== "GET" && !headers.has("origin")) headers.set("origin", new URL(this.baseUrl).origin);
    const response = await fetch(new URL(path, this.baseUrl), { ...init, headers, redirect: "manual" });
    this.remember(response);
    return response;
  }

  get(path: string, headers: Record<string, string> = {}) {
    return this.request(path, { headers });
  }

  postForm(path: string, fields: Record<string, string>, headers: Record<string, string> = {}) {
    return this.request(path, { method: "POST", body: new URLSearchParams(fields), headers });
  }

  postJson(path: string, body: unknown, headers: Record<string, string> = {}) {
    return this.request(path, { method: "POST", body: JSON.stringify(body), headers: { "content-type": "application/json", ...headers } });
  }

  /** Signs in through the page's form; throws unless it redirects (success). */
  async signIn(email: string, password = "sinewright-demo"): Promise<this> {
    const response = await this.postForm("/sign-in", { email, password, next: "" });
    if (response.status !== 302) throw new Error(`sign-in as ${email} answered ${response.status}`);
    return this;
  }
}

/** The page's HTML without React's text-node separators, so "CS-0001 rev A" reads as written. */
export async function pageText(response: Response): Promise<string> {
  return (await response.text()).replaceAll("<!-- -->", "");
}

export function uniqueEmail(label: string): string {
  return `${label}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 7)}@example.org`;
}

/**
 * Creates an account through the sign-up form (which answers "check your e-mail" and
 * signs nobody in) and signs it in with its password; its address stays unconfirmed
 * until `confirmEmail`.
 */
export async function signUp(label: string, password = "correct-horse-battery", baseUrl = BASE_URL) {
  const email = uniqueEmail(label);
  const visitor = new Visitor(baseUrl);
  const response = await visitor.postForm("/sign-up", { name: `Test ${label}`, email, password, next: "" });
  if (response.status !== 200) throw new Error(`sign-up answered ${response.status}`);
  const signedIn = await visitor.postForm("/sign-in", { email, password, next: "" });
  if (signedIn.status !== 302) throw new Error(`signing in the new account answered ${signedIn.status}`);
  return { visitor, email, password };
}

/** Follows the link of the confirmation mail sent at sign-up (which signs the visitor in); answers where it leads. */
export async function confirmEmail(visitor: Visitor, email: string): Promise<string | null> {
  const { firstLink, waitForMail } = await import("./mail");
  const link = firstLink((await waitForMail(email, /Confirm your e-mail address/)).text);
  const response = await visitor.get(link);
  if (response.status !== 302) throw new Error(`the confirmation link answered ${response.status}`);
  return response.headers.get("location");
}

/** Signs up and starts a team; the visitor is its admin. */
export async function signUpWithTeam(label: string, baseUrl = BASE_URL) {
  const account = await signUp(label, undefined, baseUrl);
  const response = await account.visitor.postForm("/teams/new", { name: `Team ${label}` });
  if (response.status !== 302) throw new Error(`creating a team answered ${response.status}`);
  return account;
}

/**
 * A team with one signed-in visitor per role, made quickly: the admin starts the
 * team through the page, the others sign up and are added as members directly.
 */
export async function teamWithRoles(label: string, roles: string[]) {
  const { serverQuery } = await import("./server-db");
  const admin = await signUpWithTeam(label);
  // By the new admin's membership, not the team's name: a name may repeat (another test, or a test run again).
  const [team] = await serverQuery<{ id: string }>(`select m.organization_id as id from member m join "user" u on u.id = m.user_id where u.email = $1`, [admin.email]);
  const people: Record<string, { visitor: Visitor; email: string; userId: string }> = {};
  const [adminRow] = await serverQuery<{ id: string }>(`select id from "user" where email = $1`, [admin.email]);
  people.admin = { visitor: admin.visitor, email: admin.email, userId: adminRow!.id };
  for (const role of roles) {
    const account = await signUp(`${label}-${role}`);
    const [row] = await serverQuery<{ id: string }>(`select id from "user" where email = $1`, [account.email]);
    await serverQuery(`insert into member (id, organization_id, user_id, role, created_at) values ($1, $2, $3, $4, now())`, [crypto.randomUUID(), team!.id, row!.id, role.replace(/\d+$/, "")]);
    people[role] = { visitor: account.visitor, email: account.email, userId: row!.id };
  }
  return { teamId: team!.id, teamName: `Team ${label}`, people };
}

/** Makes a personal API key on the Settings page and returns its secret (shown once). */
export async function createApiKey(visitor: Visitor, name: string): Promise<string> {
  const response = await visitor.postForm("/settings", { intent: "create-key", name });
  if (response.status !== 200) throw new Error(`creating an API key answered ${response.status}`);
  const match = (await response.text()).match(/(swk_[A-Za-z0-9_-]+)/);
  if (!match) throw new Error("the new key was not shown");
  return match[1]!;
}
