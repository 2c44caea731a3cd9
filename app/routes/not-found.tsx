export const meta = () => [{ title: "Nothing here · Sinewright" }];

export function loader() {
  throw new Response(null, { status: 404, statusText: "Not Found" });
}

export default function NotFound() {
  return null;
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
