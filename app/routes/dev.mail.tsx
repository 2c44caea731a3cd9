import { useLoaderData } from "react-router";
import type { Route } from "./+types/dev.mail";
import { Wordmark } from "~/components/brand-mark";
import { config } from "~/.server/config";

export const meta: Route.MetaFunction = () => [{ title: "Development mailbox · Sinewright" }];

interface CaughtMessage {
  id: number;
  receivedAt: string;
  to: string[];
  subject: string;
  text: string;
}

/** Development only: lists what the local mail catcher received, so links in e-mails can be followed without a mail server. */
export async function loader() {
  const cfg = config();
  if (cfg.DEV_PAGES !== "1" || !cfg.MAIL_CATCHER_URL) throw new Response(null, { status: 404 });
  try {
    const response = await fetch(new URL("/messages", cfg.MAIL_CATCHER_URL));
    return { messages: (await response.json()) as CaughtMessage[], reachable: true };
  } catch {
    return { messages: [] as CaughtMessage[], reachable: false };
  }
}

function linkify(text: string) {
  return text.split(/(https?:\/\/\S+)/g).map((part, i) =>
    /^https?:\/\//.test(part) ? (
      <a key={i} href={part} className="break-all text-copper-deep underline">
        {part}
      </a>
    ) : (
      part
    ),
  );
}

export default function DevMail() {
  const { messages, reachable } = useLoaderData<typeof loader>();
  return (
    <div className="mx-auto max-w-3xl px-4 py-10">
      <Wordmark />
      <h1 className="mt-6 font-serif text-3xl font-semibold">Development mailbox</h1>
      <p className="mt-2 text-sm text-ink-soft">
        Mail sent by this local server is caught here instead of being delivered. This page does not exist in production.
      </p>
      {!reachable ? <p className="mt-6 text-danger">The mail catcher is not running.</p> : null}
      {reachable && messages.length === 0 ? <p className="mt-6 text-ink-soft">No messages yet.</p> : null}
      <ol className="mt-6 space-y-4">
        {messages.map((m) => (
          <li key={m.id} className="panel p-4">
            <p className="text-xs text-ink-faint">
              {m.receivedAt.replace("T", " ").slice(0, 19)} · to {m.to.join(", ")}
            </p>
            <h2 className="mt-1 font-semibold">{m.subject}</h2>
            <pre className="mt-3 whitespace-pre-wrap font-sans text-sm text-ink-soft">{linkify(m.text)}</pre>
          </li>
        ))}
      </ol>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
