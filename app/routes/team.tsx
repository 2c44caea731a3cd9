import { data, Form, useActionData, useLoaderData, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/team";
import { FormError, Notice, TextField } from "~/components/form-fields";
import { email, fieldErrors, type FieldErrors } from "~/lib/forms/account";
import { requireMember } from "~/.server/access";
import { ROLE_LABELS, ROLES } from "~/.server/roles";
import { cancelInvitation, changeRole, inviteMember, listMembers, listPendingInvitations, removeMember, teamAudit, TeamRuleError } from "~/.server/team";
import { describeAuditEvent } from "~/lib/audit/wording";

export const meta: Route.MetaFunction = () => [{ title: "Team · Sinewright" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const isAdmin = me.team.role === "admin";
  const [members, invitations, audit] = await Promise.all([
    listMembers(me.team.teamId),
    isAdmin ? listPendingInvitations(me.team.teamId) : Promise.resolve([]),
    isAdmin ? teamAudit(me.team.teamId, 30) : Promise.resolve([]),
  ]);
  return { me: { userId: me.user.id, role: me.team.role, teamName: me.team.teamName }, isAdmin, members, invitations, audit, roles: ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] })) };
}

const role = z.enum(ROLES, { message: "Choose one of: viewer, engineer, checker, admin." });
const teamAction = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("change-role"), memberId: z.string().min(1), role }),
  z.object({ intent: z.literal("remove"), memberId: z.string().min(1) }),
  z.object({ intent: z.literal("invite"), email, role }),
  z.object({ intent: z.literal("cancel-invitation"), invitationId: z.string().min(1) }),
]);

export async function action({ request, context }: Route.ActionArgs) {
  const me = await requireMember(request, context, "admin");
  const parsed = teamAction.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ ok: false as const, errors: fieldErrors(parsed.error) as FieldErrors, done: "" }, { status: 400 });
  const input = parsed.data;
  try {
    switch (input.intent) {
      case "change-role":
        await changeRole(me, input.memberId, input.role);
        return { ok: true as const, errors: {} as FieldErrors, done: "Role changed." };
      case "remove":
        await removeMember(me, input.memberId);
        return { ok: true as const, errors: {} as FieldErrors, done: "Member removed from the team." };
      case "invite":
        await inviteMember(me, request, input.email, input.role);
        return { ok: true as const, errors: {} as FieldErrors, done: `Invitation sent to ${input.email}.` };
      case "cancel-invitation":
        await cancelInvitation(me, input.invitationId);
        return { ok: true as const, errors: {} as FieldErrors, done: "Invitation withdrawn." };
    }
  } catch (error) {
    if (error instanceof TeamRuleError) return data({ ok: false as const, errors: { form: error.message } as FieldErrors, done: "" }, { status: 400 });
    throw error;
  }
}

export default function Team() {
  const { me, isAdmin, members, invitations, audit, roles } = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const busy = useNavigation().state !== "idle";
  return (
    <div className="space-y-8">
      <header>
        <p className="eyebrow">Team</p>
        <h1 className="mt-1 font-serif text-3xl font-semibold">{me.teamName}</h1>
        <p className="mt-2 text-ink-soft">
          {members.length} {members.length === 1 ? "member" : "members"}. You are <strong>{me.role}</strong>.
          {isAdmin ? "" : " Only admins change roles and invite people."}
        </p>
      </header>

      {result?.done ? <Notice tone="success">{result.done}</Notice> : null}
      <FormError message={result?.errors.form} />

      <section aria-labelledby="members-heading" className="panel overflow-hidden">
        <h2 id="members-heading" className="border-b border-rule px-4 py-3 font-semibold">
          Members
        </h2>
        <ul className="divide-y divide-rule">
          {members.map((m) => (
            <li key={m.memberId} className="flex flex-col gap-3 px-4 py-3 sm:flex-row sm:items-center">
              <div className="min-w-0 flex-1">
                <p className="font-medium">
                  {m.name} {m.userId === me.userId ? <span className="text-xs text-ink-faint">(you)</span> : null}
                </p>
                <p className="truncate text-sm text-ink-faint">{m.email}</p>
              </div>
              {isAdmin ? (
                <div className="flex flex-wrap items-center gap-2">
                  <Form method="post" className="flex items-center gap-2">
                    <input type="hidden" name="intent" value="change-role" />
                    <input type="hidden" name="memberId" value={m.memberId} />
                    <label className="sr-only" htmlFor={`role-${m.memberId}`}>
                      Role of {m.name}
                    </label>
                    <select id={`role-${m.memberId}`} name="role" defaultValue={m.role} className="field-input !w-auto !py-1.5 text-sm">
                      {roles.map((r) => (
                        <option key={r.value} value={r.value}>
                          {r.value}
                        </option>
                      ))}
                    </select>
                    <button type="submit" className="btn btn-quiet !py-1.5" disabled={busy}>
                      Set role
                    </button>
                  </Form>
                  <Form method="post">
                    <input type="hidden" name="intent" value="remove" />
                    <input type="hidden" name="memberId" value={m.memberId} />
                    <button type="submit" className="btn btn-danger !py-1.5" disabled={busy} aria-label={`Remove ${m.name} from the team`}>
                      Remove
                    </button>
                  </Form>
                </div>
              ) : (
                <span className="rounded-full border border-rule px-2.5 py-0.5 text-xs font-medium text-ink-soft">{m.role}</span>
              )}
            </li>
          ))}
        </ul>
      </section>

      {isAdmin ? (
        <div className="grid items-start gap-8 lg:grid-cols-2">
          <section aria-labelledby="invite-heading" className="panel p-5">
            <h2 id="invite-heading" className="font-semibold">
              Invite a colleague
            </h2>
            <p className="mt-1 text-sm text-ink-soft">They get an e-mail with a link that works for seven days.</p>
            <Form method="post" className="mt-4 space-y-4" noValidate>
              <input type="hidden" name="intent" value="invite" />
              <TextField name="email" type="email" label="E-mail" autoComplete="off" error={result?.errors.email} required />
              <div>
                <label className="field-label" htmlFor="invite-role">
                  Role
                </label>
                <select id="invite-role" name="role" defaultValue="engineer" className="field-input">
                  {roles.map((r) => (
                    <option key={r.value} value={r.value}>
                      {r.label}
                    </option>
                  ))}
                </select>
              </div>
              <button type="submit" className="btn btn-primary" disabled={busy}>
                Send the invitation
              </button>
            </Form>
            {invitations.length > 0 ? (
              <div className="mt-6">
                <h3 className="text-sm font-semibold">Waiting for an answer</h3>
                <ul className="mt-2 divide-y divide-rule text-sm">
                  {invitations.map((inv) => (
                    <li key={inv.id} className="flex items-center justify-between gap-2 py-2">
                      <span>
                        {inv.email} <span className="text-ink-faint">as {inv.role}</span>
                      </span>
                      <Form method="post">
                        <input type="hidden" name="intent" value="cancel-invitation" />
                        <input type="hidden" name="invitationId" value={inv.id} />
                        <button className="text-sm text-danger underline" type="submit">
                          Withdraw
                        </button>
                      </Form>
                    </li>
                  ))}
                </ul>
              </div>
            ) : null}
          </section>
          <section aria-labelledby="audit-heading" className="panel p-5">
            <h2 id="audit-heading" className="font-semibold">
              Recent team activity
            </h2>
            {audit.length === 0 ? (
              <p className="mt-2 text-sm text-ink-soft">Nothing recorded yet.</p>
            ) : (
              <ol className="mt-3 space-y-2 text-sm">
                {audit.map((e) => (
                  <li key={e.id} className="flex gap-3">
                    <time className="w-28 shrink-0 text-ink-faint" dateTime={new Date(e.createdAt).toISOString()}>
                      {new Date(e.createdAt).toISOString().slice(0, 16).replace("T", " ")}
                    </time>
                    <span>
                      <strong className="font-medium">{e.actorName ?? "Sinewright"}</strong> {describeAuditEvent(e.action, e.detail as Record<string, unknown>)}
                    </span>
                  </li>
                ))}
              </ol>
            )}
          </section>
        </div>
      ) : null}
    </div>
  );
}


export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
