import { data, Form, Link, redirect, useActionData, useLoaderData, useLocation } from "react-router";
import type { Route } from "./+types/invitation";
import { AuthFrame } from "~/components/auth-frame";
import { FormError, Notice } from "~/components/form-fields";
import { identityOf } from "~/.server/access";
import { auth } from "~/.server/auth";
import { recordAudit } from "~/.server/audit";
import { getInvitation } from "~/.server/team";

export const meta: Route.MetaFunction = () => [{ title: "Invitation · Sinewright" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const invitation = await getInvitation(params.invitationId);
  if (!invitation) throw new Response(null, { status: 404 });
  const signedIn = await identityOf(context);
  const usable = invitation.status === "pending" && invitation.expiresAt > new Date();
  return {
    invitation: { email: invitation.email, role: invitation.role, teamName: invitation.teamName, usable, status: invitation.status },
    signedInAs: signedIn?.user.email ?? null,
    confirmed: signedIn?.emailVerified ?? false,
  };
}

const UNCONFIRMED = "Confirm your e-mail address first: open the link in the message we sent you, then accept here.";

export async function action({ request, params, context }: Route.ActionArgs) {
  const signedIn = await identityOf(context);
  if (!signedIn) throw redirect(`/sign-in?next=/invitations/${params.invitationId}`);
  const intent = (await request.formData()).get("intent");
  if (intent === "send-confirmation") {
    await auth().api.sendVerificationEmail({ body: { email: signedIn.user.email, callbackURL: `/invitations/${params.invitationId}` } });
    return { error: null, sentTo: signedIn.user.email };
  }
  // better-auth refuses too (requireEmailVerificationOnInvitation); this says what to do.
  if (!signedIn.emailVerified) return data({ error: UNCONFIRMED, sentTo: null }, { status: 400 });
  try {
    const accepted = await auth().api.acceptInvitation({ headers: request.headers, body: { invitationId: params.invitationId } });
    const teamId = accepted?.member.organizationId;
    if (teamId) {
      await auth().api.setActiveOrganization({ headers: request.headers, body: { organizationId: teamId } });
      await recordAudit({ teamId, actorId: signedIn.user.id, action: "member.joined", subjectType: "member", subjectId: signedIn.user.id, detail: { role: accepted.member.role } });
    }
  } catch {
    return data({ error: "This invitation cannot be accepted: it may have expired, been withdrawn, or be meant for another e-mail address.", sentTo: null }, { status: 400 });
  }
  throw redirect("/sheets");
}

export default function Invitation() {
  const { invitation, signedInAs, confirmed } = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const next = encodeURIComponent(useLocation().pathname);
  const mismatch = signedInAs !== null && signedInAs.toLowerCase() !== invitation.email.toLowerCase();
  return (
    <AuthFrame title={`Join ${invitation.teamName}`} lead={`You are invited as ${invitation.role}, at ${invitation.email}.`}>
      <FormError message={result?.error ?? undefined} />
      {result?.sentTo ? <Notice tone="success">{`We sent a new link to ${result.sentTo}. Open it to confirm the address; it brings you back here.`}</Notice> : null}
      {!invitation.usable ? (
        <p className="text-ink-soft">This invitation is no longer open ({invitation.status}). Ask the team's admin to send a new one.</p>
      ) : signedInAs === null ? (
        <div className="space-y-3">
          <p className="text-sm text-ink-soft">Sign in, or create an account with {invitation.email}, to accept.</p>
          <div className="flex flex-wrap gap-3">
            <Link className="btn btn-primary" to={`/sign-up?next=${next}`}>
              Create an account
            </Link>
            <Link className="btn btn-quiet" to={`/sign-in?next=${next}`}>
              Sign in
            </Link>
          </div>
        </div>
      ) : mismatch ? (
        <p className="text-sm text-ink-soft">
          You are signed in as {signedInAs}, but the invitation is for {invitation.email}. Sign out and sign in with that address.
        </p>
      ) : !confirmed ? (
        <div className="space-y-3">
          <p className="text-sm text-ink-soft">{UNCONFIRMED}</p>
          <Form method="post">
            <input type="hidden" name="intent" value="send-confirmation" />
            <button type="submit" className="btn btn-quiet">
              Send the link again
            </button>
          </Form>
        </div>
      ) : (
        <Form method="post">
          <button type="submit" className="btn btn-primary">
            Accept and join {invitation.teamName}
          </button>
        </Form>
      )}
    </AuthFrame>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
