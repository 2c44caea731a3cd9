import { describe, expect, it } from "vitest";
import { firstLink, waitForMail } from "../support/mail";
import { confirmEmail, signUp, signUpWithTeam, teamWithRoles, uniqueEmail, Visitor } from "../support/http";
import { serverQuery } from "../support/server-db";

async function memberIdOf(visitor: Visitor, email: string): Promise<string> {
  const html = await (await visitor.get("/team")).text();
  // Each member row carries its id in the hidden field of its forms, after the e-mail.
  const at = html.indexOf(email);
  const match = html.slice(at).match(/name="memberId" value="([^"]+)"/);
  if (at < 0 || !match) throw new Error(`member ${email} not found on the team page`);
  return match[1]!;
}

describe("team roles and the admin page", () => {
  it("lets an admin invite a colleague, who signs up and joins with the invited role", async () => {
    const admin = await signUpWithTeam("inviter");
    const email = uniqueEmail("invitee");
    const invite = await admin.visitor.postForm("/team", { intent: "invite", email, role: "checker" });
    expect(invite.status).toBe(200);
    expect(await invite.text()).toContain(`Invitation sent to ${email}`);

    const mail = await waitForMail(email, /invited you to Team inviter/);
    const link = firstLink(mail.text);
    const path = new URL(link).pathname;
    expect(path).toMatch(/^\/invitations\//);

    const newcomer = new Visitor();
    const landing = await newcomer.get(path);
    expect(landing.status).toBe(200);
    expect(await landing.text()).toContain("Create an account");
    const created = await newcomer.postForm("/sign-up", { name: "New Checker", email, password: "a-long-enough-password", next: path });
    expect(created.status).toBe(200);
    expect(await created.text()).toContain(`We sent a message to ${email}`);
    // The confirmation link signs the newcomer in and brings them back to the invitation.
    expect(await confirmEmail(newcomer, email)).toBe(path);
    const accept = await newcomer.postForm(path, {});
    expect(accept.status).toBe(302);

    const teamPage = await (await newcomer.get("/team")).text();
    expect(teamPage).toContain("Team inviter");
    expect(teamPage).toMatch(/You are <strong[^>]*>checker<\/strong>/);
  });

  it("refuses an invitation link for a different signed-in address", async () => {
    const admin = await signUpWithTeam("inviter2");
    const email = uniqueEmail("meant-for");
    await admin.visitor.postForm("/team", { intent: "invite", email, role: "engineer" });
    const link = firstLink((await waitForMail(email, /invited you/)).text);
    const stranger = (await signUp("stranger")).visitor;
    const accept = await stranger.postForm(new URL(link).pathname, {});
    expect(accept.status).toBe(400);
    expect((await stranger.get("/sheets")).headers.get("location")).toBe("/teams/new");
  });

  for (const role of ["viewer", "engineer", "checker"] as const) {
    it(`shows the ${role} the member list but refuses every admin action on the server (403)`, async () => {
      const visitor = await new Visitor().signIn(`${role}@example.com`);
      const page = await visitor.get("/team");
      expect(page.status).toBe(200);
      const html = await page.text();
      expect(html).toContain("admin@example.com");
      expect(html).not.toContain("Set role");
      expect(html).not.toContain("Send the invitation");

      const admin = await new Visitor().signIn("admin@example.com");
      const someone = await memberIdOf(admin, "viewer@example.com");
      const attempts: Record<string, string>[] = [
        { intent: "change-role", memberId: someone, role: "admin" },
        { intent: "remove", memberId: someone },
        { intent: "invite", email: uniqueEmail("sneaky"), role: "admin" },
        { intent: "cancel-invitation", invitationId: "anything" },
      ];
      for (const attempt of attempts) {
        const response = await visitor.postForm("/team", attempt);
        expect(response.status, `${role} ${attempt.intent}`).toBe(403);
      }
      // Nothing changed: the viewer is still a viewer.
      expect(await (await admin.get("/team")).text()).toContain("viewer@example.com");
    });
  }

  it("lets an admin change a role and remove a member, recording both in the team's activity", async () => {
    const admin = await signUpWithTeam("roles");
    const colleague = uniqueEmail("colleague");
    await admin.visitor.postForm("/team", { intent: "invite", email: colleague, role: "engineer" });
    const path = new URL(firstLink((await waitForMail(colleague, /invited you/)).text)).pathname;
    const joiner = new Visitor();
    await joiner.postForm("/sign-up", { name: "Col League", email: colleague, password: "a-long-enough-password", next: path });
    await confirmEmail(joiner, colleague);
    expect((await joiner.postForm(path, {})).status).toBe(302);

    const memberId = await memberIdOf(admin.visitor, colleague);
    const promote = await admin.visitor.postForm("/team", { intent: "change-role", memberId, role: "checker" });
    expect(promote.status).toBe(200);
    expect(await (await joiner.get("/team")).text()).toMatch(/You are <strong[^>]*>checker<\/strong>/);

    const bad = await admin.visitor.postForm("/team", { intent: "change-role", memberId, role: "overlord" });
    expect(bad.status).toBe(400);
    expect(await bad.text()).toContain("Choose one of: viewer, engineer, checker, admin.");

    const remove = await admin.visitor.postForm("/team", { intent: "remove", memberId });
    expect(remove.status).toBe(200);
    expect((await joiner.get("/sheets")).headers.get("location")).toBe("/teams/new");
    const activity = await (await admin.visitor.get("/team")).text();
    expect(activity).toContain("changed a role from engineer to checker");
    expect(activity).toContain("removed a member");
  });

  it("never removes or demotes the last admin", async () => {
    const admin = await signUpWithTeam("lonely");
    const selfId = await memberIdOf(admin.visitor, admin.email);
    const remove = await admin.visitor.postForm("/team", { intent: "remove", memberId: selfId });
    expect(remove.status).toBe(400);
    expect(await remove.text()).toContain("A team needs at least one admin");
    const demote = await admin.visitor.postForm("/team", { intent: "change-role", memberId: selfId, role: "engineer" });
    expect(demote.status).toBe(400);
    expect(await (await admin.visitor.get("/team")).text()).toMatch(/You are <strong[^>]*>admin<\/strong>/);
  });

  it("keeps teams apart: another team's admin sees none of its members and cannot act on them", async () => {
    const other = await signUpWithTeam("outsider");
    const page = await (await other.visitor.get("/team")).text();
    expect(page).not.toContain("engineer@example.com");
    const demoAdmin = await new Visitor().signIn("admin@example.com");
    const demoMember = await memberIdOf(demoAdmin, "engineer@example.com");
    const attack = await other.visitor.postForm("/team", { intent: "remove", memberId: demoMember });
    expect(attack.status).toBe(400);
    expect(await (await demoAdmin.get("/team")).text()).toContain("engineer@example.com");

    const demoTeamId = await teamIdOf(demoAdmin);
    const hop = await other.visitor.postForm("/teams/switch", { teamId: demoTeamId });
    expect(hop.status).toBe(403);
  });

  it("sends anonymous visitors of app pages to sign-in", async () => {
    for (const path of ["/sheets", "/projects", "/search", "/team", "/settings"]) {
      const response = await new Visitor().get(path);
      expect(response.status, path).toBe(302);
      expect(response.headers.get("location"), path).toBe(`/sign-in?next=${encodeURIComponent(path)}`);
    }
    const post = await new Visitor().postForm("/team", { intent: "remove", memberId: "x" });
    expect(post.status).toBe(302);
    expect(post.headers.get("location")).toBe("/sign-in?next=%2Fteam");
  });
  it("lets only a confirmed address accept its invitation", async () => {
    const admin = await signUpWithTeam("confirm-first");
    const { visitor: invitee, email } = await signUp("unconfirmed");
    await admin.visitor.postForm("/team", { intent: "invite", email, role: "engineer" });
    const path = new URL(firstLink((await waitForMail(email, /invited you/)).text)).pathname;
    const page = await invitee.get(path);
    expect(await page.text()).toContain("Confirm your e-mail address first");
    const refused = await invitee.postForm(path, {});
    expect(refused.status).toBe(400);
    expect(await refused.text()).toContain("Confirm your e-mail address first");
    expect((await invitee.get("/sheets")).headers.get("location")).toBe("/teams/new");

    await confirmEmail(invitee, email);
    expect((await invitee.postForm(path, {})).status).toBe(302);
    expect(await (await invitee.get("/team")).text()).toContain("Team confirm-first");
  });
});

describe("better-auth's own team endpoints", () => {
  async function membersOf(teamId: string) {
    return serverQuery<{ user_id: string; role: string }>(`select user_id, role from member where organization_id = $1 order by user_id`, [teamId]);
  }
  async function auditCount(teamId: string) {
    const [row] = await serverQuery<{ n: string }>(`select count(*) as n from audit_event where team_id = $1`, [teamId]);
    return Number(row!.n);
  }

  it("refuse team changes made straight over HTTP, which would skip the team's activity record", async () => {
    const { teamId, people } = await teamWithRoles("direct", ["engineer", "viewer"]);
    const admin = people.admin!.visitor;
    const [viewerMember] = await serverQuery<{ id: string }>(`select id from member where organization_id = $1 and user_id = $2`, [teamId, people.viewer!.userId]);
    const before = { members: await membersOf(teamId), audit: await auditCount(teamId) };
    const invitee = uniqueEmail("direct-invitee");
    const attempts: [string, Visitor, Record<string, unknown>][] = [
      ["/api/auth/organization/remove-member", admin, { memberIdOrEmail: viewerMember!.id, organizationId: teamId }],
      ["/api/auth/organization/update-member-role", admin, { memberId: viewerMember!.id, role: "admin", organizationId: teamId }],
      ["/api/auth/organization/invite-member", admin, { email: invitee, role: "admin", organizationId: teamId }],
      ["/api/auth/organization/leave", people.engineer!.visitor, { organizationId: teamId }],
      ["/api/auth/organization/update", admin, { organizationId: teamId, data: { name: "Renamed behind the audit trail" } }],
      ["/api/auth/organization/delete", admin, { organizationId: teamId }],
      ["/api/auth/organization/create", admin, { name: "Unrecorded team", slug: `unrecorded-${Date.now()}` }],
    ];
    for (const [path, caller, body] of attempts) {
      const response = await caller.postJson(path, body);
      expect(response.status, path).toBe(403);
      expect((await response.json()).message, path).toContain("Team page");
    }
    expect(await membersOf(teamId)).toEqual(before.members);
    expect(await auditCount(teamId)).toBe(before.audit);
    expect(await serverQuery(`select 1 from invitation where email = $1`, [invitee])).toEqual([]);
    expect(await serverQuery(`select 1 from organization where name in ('Renamed behind the audit trail', 'Unrecorded team')`)).toEqual([]);
    // Reading stays open: endpoints that change nothing still answer.
    expect((await admin.get(`/api/auth/organization/list-members?organizationId=${teamId}`)).status).toBe(200);
  });

  it("refuse accepting an invitation straight over HTTP; the invitation page accepts it and records the join", async () => {
    const admin = await signUpWithTeam("direct-accept");
    const { visitor: invitee, email } = await signUp("direct-accepter");
    await confirmEmail(invitee, email);
    await admin.visitor.postForm("/team", { intent: "invite", email, role: "viewer" });
    const path = new URL(firstLink((await waitForMail(email, /invited you/)).text)).pathname;
    const invitationId = path.split("/")[2]!;
    const direct = await invitee.postJson("/api/auth/organization/accept-invitation", { invitationId });
    expect(direct.status).toBe(403);
    expect((await invitee.get("/sheets")).headers.get("location")).toBe("/teams/new");
    expect((await invitee.postForm(path, {})).status).toBe(302);
    expect(await (await admin.visitor.get("/team")).text()).toContain("joined the team as viewer");
  });
});

/** The demo team's id, read through better-auth's own API as its admin. */
async function teamIdOf(visitor: Visitor): Promise<string> {
  const response = await visitor.get("/api/auth/organization/list");
  const teams = (await response.json()) as { id: string; name: string }[];
  return teams.find((t) => t.name === "Larkfield Power Systems")!.id;
}
