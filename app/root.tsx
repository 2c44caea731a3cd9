import { Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import { identify } from "./.server/access";
import { originGuard } from "./.server/origin-guard";
import { enforceApiRateLimit } from "./.server/rate-limit";
import { noteRoute } from "./.server/request-log";
import "./app.css";

export const middleware: Route.MiddlewareFunction[] = [
  identify,
  async ({ request, pattern, context }, next) => {
    noteRoute(pattern);
    originGuard(request);
    await enforceApiRateLimit(request, context);
    return next();
  },
];

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.ico", sizes: "32x32" }];

export function Layout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen">
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

/** Errors outside any page-level boundary (e.g. in the layout itself). */
export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
