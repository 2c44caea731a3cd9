import { useLoaderData } from "react-router";
import type { Route } from "./+types/search";
import { EmptyState, PageHeader } from "~/components/empty-state";
import { requireMember } from "~/.server/access";

export const meta: Route.MetaFunction = () => [{ title: "Search · Sinewright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const me = await requireMember(request, "viewer");
  return { teamName: me.team.teamName };
}

export default function Search() {
  const { teamName } = useLoaderData<typeof loader>();
  return (
    <>
      <PageHeader eyebrow={teamName} title="Search" />
      <EmptyState title="Nothing to search yet">
        Search finds past calc sheets and documents of {teamName} by title, prose, tags, calculator and the values of their inputs
        and results. It fills as the team writes sheets.
      </EmptyState>
    </>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
