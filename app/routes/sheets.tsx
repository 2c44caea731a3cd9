import { Link, useLoaderData } from "react-router";
import type { Route } from "./+types/sheets";
import { EmptyState, PageHeader } from "~/components/empty-state";
import { requireMember } from "~/.server/access";

export const meta: Route.MetaFunction = () => [{ title: "Sheets · Sinewright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const me = await requireMember(request, "viewer");
  return { teamName: me.team.teamName, role: me.team.role };
}

export default function Sheets() {
  const { teamName } = useLoaderData<typeof loader>();
  return (
    <>
      <PageHeader eyebrow={teamName} title="Calc sheets" />
      <EmptyState
        title="No calc sheets in this team yet"
        action={
          <Link className="btn btn-quiet" to="/calculators">
            Browse the calculators
          </Link>
        }
      >
        A calc sheet holds one design calculation — prose, math and live calculators — with every input and result stored per
        revision, so a checker can verify it and project documents can cite it.
      </EmptyState>
    </>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
