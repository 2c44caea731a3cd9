import { data, Form, useActionData, useLoaderData, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/settings";
import { FormError, Notice, TextField } from "~/components/form-fields";
import { fieldErrors, type FieldErrors } from "~/lib/forms/account";
import { requireMember } from "~/.server/access";
import { createApiKey, listApiKeys, revokeApiKey } from "~/.server/api-keys";
import { recordAudit } from "~/.server/audit";

export const meta: Route.MetaFunction = () => [{ title: "Settings · Sinewright" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  return { user: me.user, teamName: me.team.teamName, role: me.team.role, keys: await listApiKeys(me.user.id, me.team.teamId) };
}

const keyAction = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("create-key"), name: z.string().trim().min(1, "Name the key after where it is used, e.g. “bench laptop script”.").max(60, "Use at most 60 characters.") }),
  z.object({ intent: z.literal("revoke-key"), keyId: z.string().min(1) }),
]);

export async function action({ request, context }: Route.ActionArgs) {
  const me = await requireMember(request, context, "viewer");
  const parsed = keyAction.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) as FieldErrors, secret: null, done: "" }, { status: 400 });
  if (parsed.data.intent === "create-key") {
    const key = await createApiKey(me.user.id, me.team.teamId, parsed.data.name);
    await recordAudit({ teamId: me.team.teamId, actorId: me.user.id, action: "api-key.created", subjectType: "api-key", subjectId: key.id, detail: { name: parsed.data.name } });
    return { errors: {} as FieldErrors, secret: key.secret, done: `Key “${parsed.data.name}” created.` };
  }
  const revoked = await revokeApiKey(me.user.id, parsed.data.keyId);
  if (!revoked) return data({ errors: { form: "That key is not yours or is already revoked." } as FieldErrors, secret: null, done: "" }, { status: 404 });
  await recordAudit({ teamId: me.team.teamId, actorId: me.user.id, action: "api-key.revoked", subjectType: "api-key", subjectId: parsed.data.keyId });
  return { errors: {} as FieldErrors, secret: null, done: "Key revoked: requests using it are refused from now on." };
}

export default function Settings() {
  const { user, teamName, role, keys } = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const busy = useNavigation().state !== "idle";
  return (
    <div className="space-y-8">
      <header>
        <p className="eyebrow">Settings</p>
        <h1 className="mt-1 font-serif text-3xl font-semibold">{user.name}</h1>
        <p className="mt-2 text-ink-soft">
          {user.email} · {role} in {teamName}
        </p>
      </header>
      <section aria-labelledby="keys-heading" className="panel p-5">
        <h2 id="keys-heading" className="font-semibold">
          Personal API keys
        </h2>
        <p className="mt-1 max-w-2xl text-sm text-ink-soft">
          A key lets your own scripts call the Sinewright API as you, in {teamName}, with your role. Send it as{" "}
          <code className="rounded bg-paper px-1">Authorization: Bearer …</code>. It is shown once; we keep only a hash of it.
        </p>
        {result?.done ? (
          <div className="mt-4">
            <Notice tone="success">{result.done}</Notice>
          </div>
        ) : null}
        {result?.secret ? (
          <div className="mt-3 rounded-md border border-rule-strong bg-paper p-3">
            <p className="text-sm font-medium">Copy the key now — it will not be shown again:</p>
            <output className="mt-2 block break-all font-mono text-sm" aria-label="New API key">
              {result.secret}
            </output>
          </div>
        ) : null}
        <div className="mt-4">
          <FormError message={result?.errors.form} />
        </div>
        <Form method="post" className="mt-4 flex flex-col gap-3 sm:flex-row sm:items-end" noValidate>
          <input type="hidden" name="intent" value="create-key" />
          <div className="flex-1">
            <TextField name="name" label="Key name" placeholder="e.g. sizing script on the lab PC" error={result?.errors.name} />
          </div>
          <button type="submit" className="btn btn-primary" disabled={busy}>
            Create a key
          </button>
        </Form>
        {keys.length === 0 ? (
          <p className="mt-6 text-sm text-ink-faint">You have no keys in this team.</p>
        ) : (
          <table className="mt-6 w-full text-left text-sm">
            <caption className="sr-only">Your API keys</caption>
            <thead>
              <tr className="border-b border-rule text-ink-faint">
                <th className="py-2 font-medium">Name</th>
                <th className="py-2 font-medium">Starts with</th>
                <th className="hidden py-2 font-medium sm:table-cell">Last used</th>
                <th className="py-2">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {keys.map((k) => (
                <tr key={k.id} className="border-b border-rule last:border-0">
                  <td className="py-2">{k.name}</td>
                  <td className="py-2 font-mono">{k.prefix}…</td>
                  <td className="hidden py-2 text-ink-faint sm:table-cell">{k.lastUsedAt ? new Date(k.lastUsedAt).toISOString().slice(0, 10) : "never"}</td>
                  <td className="py-2 text-right">
                    <Form method="post">
                      <input type="hidden" name="intent" value="revoke-key" />
                      <input type="hidden" name="keyId" value={k.id} />
                      <button type="submit" className="text-sm text-danger underline">
                        Revoke<span className="sr-only"> key {k.name}</span>
                      </button>
                    </Form>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
