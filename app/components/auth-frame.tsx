import { Link } from "react-router";
import { Wordmark } from "./brand-mark";

/** The frame around sign-in, sign-up and password pages: a single sheet on paper. */
export function AuthFrame({ title, lead, children, footer }: { title: string; lead?: string; children: React.ReactNode; footer?: React.ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center px-4 py-10 sm:py-16">
      <Link to="/" className="mb-8 no-underline" aria-label="Sinewright home">
        <Wordmark />
      </Link>
      <main className="panel w-full max-w-md p-6 shadow-[0_1px_0_var(--color-rule)] sm:p-8">
        <h1 className="font-serif text-2xl font-semibold">{title}</h1>
        {lead ? <p className="mt-2 text-sm text-ink-soft">{lead}</p> : null}
        <div className="mt-6">{children}</div>
      </main>
      {footer ? <div className="mt-6 text-sm text-ink-soft">{footer}</div> : null}
    </div>
  );
}
