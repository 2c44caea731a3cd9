import { useLoaderData } from "react-router";
import type { Route } from "./+types/projects";
import { EmptyState, PageHeader } from "~/components/empty-state";
import { requireMember } from "~/.server/access";

export const meta: Route.MetaFunction = () => [{ title: "Projects · Sinewright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const me = await requireMember(request, "viewer");
  return { teamName: me.team.teamName };
}

export default function Projects() {
  const { teamName } = useLoaderData<typeof loader>();
  return (
    <>
      <PageHeader eyebrow={teamName} title="Projects" />
      <EmptyState title="No projects yet">
        A project gathers the calc sheets and documents of one product or job — an off-grid inverter, a backup supply — with its
        client and code, so its design report can cite checked revisions.
      </EmptyState>
    </>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
