import { Form, Link, useLoaderData } from "react-router";
import type { Route } from "./+types/desk";
import { EmptyState, PageHeader } from "~/components/empty-state";
import { sheetNumberLabel } from "~/lib/sheets/numbering";
import { requireMember } from "~/.server/access";
import { listNotifications, markNotificationsRead, waitingForMe } from "~/.server/review";

export const meta: Route.MetaFunction = () => [{ title: "Your desk · Sinewright" }];

/** What needs the member: revisions waiting for their check, and notices about their own work. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const [waiting, notices] = await Promise.all([waitingForMe(me), listNotifications(me)]);
  return {
    waiting: waiting.map((w) => ({ ...w, sheet: sheetNumberLabel(w.sheetNumber), requestedAt: w.requestedAt.toISOString() })),
    notices: notices.map((n) => ({ id: n.id, message: n.message, link: n.link, kind: n.kind, unread: n.readAt === null, createdAt: n.createdAt.toISOString() })),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const me = await requireMember(request, context, "viewer");
  await markNotificationsRead(me);
  return { ok: true };
}

export default function Desk() {
  const { waiting, notices } = useLoaderData<typeof loader>();
  const unread = notices.filter((n) => n.unread).length;
  return (
    <>
      <PageHeader eyebrow="Your desk" title="Waiting for you" />
      {waiting.length === 0 ? (
        <EmptyState title="No checks waiting for you">When a colleague sends you a revision to check, it appears here and you get an e-mail.</EmptyState>
      ) : (
        <ul className="panel divide-y divide-rule">
          {waiting.map((w) => (
            <li key={`${w.sheet}-${w.label}`} className="flex flex-col gap-1 px-4 py-3 sm:flex-row sm:items-center sm:gap-4">
              <Link to={`/sheets/${w.sheet}/revisions/${w.label}`} className="font-mono">
                {w.sheet} rev {w.label}
              </Link>
              <span className="flex-1">{w.title}</span>
              <span className="text-sm text-ink-faint">
                from {w.requestedBy ?? "—"}, {w.requestedAt.slice(0, 10)}
              </span>
            </li>
          ))}
        </ul>
      )}
      <section aria-labelledby="notices-heading" className="mt-10">
        <div className="flex items-center justify-between">
          <h2 id="notices-heading" className="font-serif text-xl font-semibold">
            Notices {unread > 0 ? <span className="text-sm font-normal text-copper-deep">({unread} new)</span> : null}
          </h2>
          {unread > 0 ? (
            <Form method="post">
              <button type="submit" className="btn btn-quiet">
                Mark all as read
              </button>
            </Form>
          ) : null}
        </div>
        {notices.length === 0 ? (
          <p className="mt-2 text-sm text-ink-faint">Nothing yet. Checks requested from you, returned or verified revisions, and replies to your comments are listed here.</p>
        ) : (
          <ol className="mt-3 space-y-2">
            {notices.map((n) => (
              <li key={n.id} className={`panel px-4 py-3 text-sm ${n.unread ? "border-l-4 border-l-copper" : ""}`}>
                <Link to={n.link} className="no-underline hover:underline">
                  {n.message}
                </Link>
                <span className="block text-xs text-ink-faint">
                  {n.unread ? "new · " : ""}
                  {n.createdAt.slice(0, 16).replace("T", " ")} UTC
                </span>
              </li>
            ))}
          </ol>
        )}
      </section>
    </>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
