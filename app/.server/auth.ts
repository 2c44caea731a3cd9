import { betterAuth } from "better-auth";
import { APIError, createAuthMiddleware } from "better-auth/api";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { organization } from "better-auth/plugins";
import { createAccessControl } from "better-auth/plugins/access";
import { adminAc, defaultStatements } from "better-auth/plugins/organization/access";
import { config, trustedOrigins } from "./config";
import { db } from "./db/client";
import { loggableError, logger } from "./logger";
import * as schema from "./db/schema";
import { enqueueMail } from "./mail/outbox";

// Only admins manage the team through better-auth's organization endpoints;
// the other roles' powers (writing and checking sheets) are enforced by requireMember.
const ac = createAccessControl(defaultStatements);
const noTeamPowers = ac.newRole({ organization: [], member: [], invitation: [], team: [], ac: [] });
const roles = {
  admin: ac.newRole(adminAc.statements),
  checker: noTeamPowers,
  engineer: noTeamPowers,
  viewer: noTeamPowers,
};

/** A session lasts two weeks and is extended by the first request a day after its last extension. */
const SESSION_SECONDS = 60 * 60 * 24 * 14;
const SESSION_REFRESH_SECONDS = 60 * 60 * 24;

/**
 * better-auth's own endpoints for changing a team. The Team, invitation and new-team
 * pages make these changes through `auth().api` and record each in the team's
 * activity; called straight over HTTP they would skip that record, so the handler
 * refuses them.
 */
const TEAM_CHANGES_THROUGH_PAGES = new Set([
  "/organization/create",
  "/organization/update",
  "/organization/delete",
  "/organization/invite-member",
  "/organization/cancel-invitation",
  "/organization/accept-invitation",
  "/organization/reject-invitation",
  "/organization/remove-member",
  "/organization/update-member-role",
  "/organization/add-member",
  "/organization/leave",
]);

/** The client IP header our server sets from the socket (or trusted proxy); clients cannot forge it. */
export const CLIENT_IP_HEADER = "x-sinewright-client-ip";

function createAuth() {
  const cfg = config();
  return betterAuth({
    appName: "Sinewright",
    baseURL: cfg.APP_URL,
    basePath: "/api/auth",
    secret: cfg.BETTER_AUTH_SECRET,
    trustedOrigins: trustedOrigins(),
    database: drizzleAdapter(db(), { provider: "pg", schema }),
    emailAndPassword: {
      enabled: true,
      minPasswordLength: 10,
      resetPasswordTokenExpiresIn: 60 * 60,
      revokeSessionsOnPasswordReset: true,
      // Sign-up answers the same whether or not the address has an account: a new account
      // gets a link to confirm its address (which signs it in), an existing one a note instead.
      autoSignIn: false,
      async onExistingUserSignUp({ user }) {
        await enqueueMail({
          to: user.email,
          subject: "Someone tried to create a Sinewright account with your address",
          text:
            `Someone (hopefully you) tried to create a Sinewright account for ${user.email}, which already has one.\n\n` +
            `Sign in here: ${new URL("/sign-in", cfg.APP_URL)}\n` +
            `Forgotten the password? Choose a new one here: ${new URL("/forgot-password", cfg.APP_URL)}\n\n` +
            `If it was not you, ignore this message; nothing has changed.`,
        });
      },
      async sendResetPassword({ user, url }) {
        await enqueueMail({
          to: user.email,
          subject: "Reset your Sinewright password",
          text:
            `Someone (hopefully you) asked to reset the password for ${user.email}.\n\n` +
            `Choose a new password here (the link works for one hour):\n${url}\n\n` +
            `If you did not ask for this, ignore this message; your password stays as it is.`,
        });
      },
    },
    emailVerification: {
      sendOnSignUp: true,
      autoSignInAfterVerification: true,
      expiresIn: 60 * 60 * 24,
      async sendVerificationEmail({ user, url }) {
        await enqueueMail({
          to: user.email,
          subject: "Confirm your e-mail address for Sinewright",
          text:
            `Welcome to Sinewright, ${user.name}.\n\n` +
            `Confirm that ${user.email} is yours and sign in here (the link works for one day):\n${url}\n\n` +
            `If you did not create an account, ignore this message.`,
        });
      },
    },
    hooks: {
      before: createAuthMiddleware(async (ctx) => {
        // Only calls that came over HTTP carry a request; the pages call auth().api without one.
        if (ctx.request && TEAM_CHANGES_THROUGH_PAGES.has(ctx.path)) {
          throw new APIError("FORBIDDEN", { message: "Team changes are made on Sinewright's Team page, which records them in the team's activity." });
        }
      }),
    },
    session: { expiresIn: SESSION_SECONDS, updateAge: SESSION_REFRESH_SECONDS },
    rateLimit: {
      enabled: cfg.RATE_LIMITS === "on",
      storage: "database",
      window: 60,
      max: 100,
      customRules: {
        "/sign-in/email": { window: 60, max: 10 },
        "/sign-up/email": { window: 60, max: 10 },
        "/request-password-reset": { window: 300, max: 5 },
        "/reset-password": { window: 300, max: 10 },
      },
    },
    advanced: {
      ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
      useSecureCookies: cfg.APP_URL.startsWith("https://"),
      defaultCookieAttributes: { sameSite: "lax", httpOnly: true },
    },
    telemetry: { enabled: false },
    // better-auth's own messages go to our JSON log, errors without the query parameters they carry (session tokens).
    logger: {
      level: "warn",
      log: (level, message, ...args) => {
        const error = args.find((arg) => arg instanceof Error);
        logger()[level]({ ...(error ? { err: loggableError(error) } : {}) }, `[auth] ${message}`);
      },
    },
    plugins: [
      organization({
        ac,
        roles,
        creatorRole: "admin",
        allowUserToCreateOrganization: true,
        invitationExpiresIn: 60 * 60 * 24 * 7,
        cancelPendingInvitationsOnReInvite: true,
        // Joining a team needs the invited address to be the account's, confirmed.
        requireEmailVerificationOnInvitation: true,
        async sendInvitationEmail({ email, role, organization: team, inviter, id }) {
          const url = new URL(`/invitations/${id}`, cfg.APP_URL).toString();
          await enqueueMail({
            to: email,
            subject: `${inviter.user.name} invited you to ${team.name} on Sinewright`,
            text:
              `${inviter.user.name} (${inviter.user.email}) invited you to join the team "${team.name}" on Sinewright as ${role}.\n\n` +
              `Accept the invitation here (it works for seven days):\n${url}\n\n` +
              `Sign up with this e-mail address (${email}) if you have no account yet.`,
          });
        },
      }),
    ],
  });
}

export type Auth = ReturnType<typeof createAuth>;
let instance: Auth | undefined;

export function auth(): Auth {
  instance ??= createAuth();
  return instance;
}

/**
 * better-auth answers its own rate limit with 429 and `X-Retry-After`; clients and
 * proxies read the standard `Retry-After`, so every 429 from it carries both.
 */
export async function handleAuthRequest(request: Request): Promise<Response> {
  const response = await auth().handler(request);
  const retryAfter = response.headers.get("x-retry-after");
  if (response.status !== 429 || !retryAfter) return response;
  const headers = new Headers(response.headers);
  headers.set("Retry-After", retryAfter);
  return new Response(response.body, { status: 429, statusText: response.statusText, headers });
}

/**
 * Sign-in, sign-up and password-reset forms call better-auth through its HTTP handler, not
 * `auth().api`, because only the handler applies its per-client rate limits: the page and
 * the JSON endpoint then share one counter per client address.
 */
export function callAuthEndpoint(request: Request, path: `/${string}`, body: Record<string, unknown>): Promise<Response> {
  const headers = new Headers({ "content-type": "application/json", origin: new URL(config().APP_URL).origin });
  for (const name of ["cookie", "user-agent", CLIENT_IP_HEADER]) {
    const value = request.headers.get(name);
    if (value) headers.set(name, value);
  }
  return handleAuthRequest(new Request(new URL(`/api/auth${path}`, config().APP_URL), { method: "POST", headers, body: JSON.stringify(body) }));
}
