import { Link, useLoaderData } from "react-router";
import type { Route } from "./+types/home";
import { Wordmark } from "~/components/brand-mark";
import { HardwareCaution } from "~/components/caution";
import { VerificationStamp } from "~/components/verification-stamp";
import { ENGINE_VERSION } from "~/lib/calc/version";
import { identityOf } from "~/.server/access";

export const meta: Route.MetaFunction = () => [
  { title: "Sinewright — checked inverter design calculations for engineering teams" },
  { name: "description", content: "Calc sheets with live inverter calculators, second-engineer checking, and project documents that cite exact revisions." },
];

export async function loader({ context }: Route.LoaderArgs) {
  return { signedIn: (await identityOf(context)) !== null };
}

const FEATURES = [
  {
    title: "Calc sheets that compute",
    body: "Write the reasoning in prose and math, drop in calculators for square, quasi-square, staircase, six-step and sine-PWM outputs, LC filters, DC links and switch stress. Results update as you type, in engineering units.",
  },
  {
    title: "A second engineer, on record",
    body: "Send a revision to a checker. They comment, re-run any block with their own inputs, and verify it. The verification is bound to a hash of exactly what was checked.",
  },
  {
    title: "Citations that know when they age",
    body: "Design reports and certification files cite exact revisions, and say so when a cited sheet has a newer verified revision or needs a re-check.",
  },
  {
    title: "Past work, found and reused",
    body: "Search prose, tags and the values of inputs and results — “fsw 20 kHz”, “quasi-square 48 V” — and reuse a sheet in a new project with its lineage kept.",
  },
];

export default function Home() {
  const { signedIn } = useLoaderData<typeof loader>();
  return (
    <div className="min-h-screen">
      <header className="mx-auto flex max-w-6xl items-center justify-between px-4 py-5 sm:px-6">
        <Wordmark />
        <nav aria-label="Account" className="flex items-center gap-2">
          {signedIn ? (
            <Link className="btn btn-primary" to="/sheets">
              Open your sheets
            </Link>
          ) : (
            <>
              <Link className="btn btn-quiet" to="/sign-in">
                Sign in
              </Link>
              <Link className="btn btn-primary hidden sm:inline-flex" to="/sign-up">
                Create an account
              </Link>
            </>
          )}
        </nav>
      </header>
      <main>
        <section className="mx-auto grid max-w-6xl gap-10 px-4 pb-16 pt-8 sm:px-6 lg:grid-cols-[1.1fr_0.9fr] lg:pt-16">
          <div>
            <p className="eyebrow">For power-electronics teams</p>
            <h1 className="mt-3 font-serif text-4xl font-semibold leading-tight sm:text-5xl">
              Inverter design calculations your checker can sign.
            </h1>
            <p className="mt-5 max-w-xl text-lg leading-relaxed text-ink-soft">
              Sinewright is the team's book of calculations for DC-to-AC inverters — solar and battery inverters, UPS, drives, off-grid
              supplies. Every number is computed by one tested engine, stored per revision, checked by a second engineer, and cited
              by the documents that depend on it.
            </p>
            <div className="mt-8 flex flex-wrap gap-3">
              <Link className="btn btn-primary" to={signedIn ? "/sheets" : "/sign-up"}>
                {signedIn ? "Go to your sheets" : "Start a team"}
              </Link>
              <Link className="btn btn-quiet" to="/sign-in">
                Sign in with a demo account
              </Link>
            </div>
          </div>
          <figure className="panel relative self-start p-5 font-serif shadow-[6px_6px_0_var(--color-rule)]" aria-label="A calc sheet excerpt">
            <div className="flex items-start justify-between border-b border-rule pb-3 font-sans text-xs text-ink-faint">
              <span>CS-0042 · Rev B</span>
              <span>Output stage, 48 V battery inverter</span>
            </div>
            <p className="mt-4 text-[15px] leading-relaxed">
              With a zero interval of α = 30° at each edge, the quasi-square output loses its third harmonic and every odd
              multiple of it, while the fundamental keeps 87 % of the square wave's amplitude.
            </p>
            <table className="mt-4 w-full font-sans text-sm">
              <caption className="sr-only">Example results</caption>
              <tbody>
                {[
                  ["Output RMS", "39.2 V"],
                  ["Fundamental RMS", "37.4 V"],
                  ["THD (all orders)", "31.1 %"],
                ].map(([label, value]) => (
                  <tr key={label} className="border-b border-rule last:border-0">
                    <th scope="row" className="py-1.5 text-left font-normal text-ink-soft">
                      {label}
                    </th>
                    <td className="py-1.5 text-right font-mono">{value}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <div className="mt-4 font-sans">
              <VerificationStamp checkerName="a second engineer" date="2026-11-30" contentHash="3f9a61d07c21e" engineVersion={ENGINE_VERSION} valid />
            </div>
          </figure>
        </section>
        <section aria-labelledby="what-heading" className="border-t border-rule bg-sheet">
          <div className="mx-auto max-w-6xl px-4 py-14 sm:px-6">
            <h2 id="what-heading" className="font-serif text-2xl font-semibold">
              Why more than hand calculations and spreadsheets
            </h2>
            <p className="mt-3 max-w-3xl text-ink-soft">
              A spreadsheet shows numbers but not who checked them, against which inputs, or whether the report that quotes them is
              still quoting the current version. Sinewright keeps all three.
            </p>
            <ul className="mt-8 grid gap-6 sm:grid-cols-2">
              {FEATURES.map((f) => (
                <li key={f.title} className="border-l-2 border-copper pl-4">
                  <h3 className="font-semibold">{f.title}</h3>
                  <p className="mt-1 text-sm leading-relaxed text-ink-soft">{f.body}</p>
                </li>
              ))}
            </ul>
          </div>
        </section>
        <section className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
          <HardwareCaution />
        </section>
      </main>
      <footer className="border-t border-rule">
        <div className="mx-auto max-w-6xl px-4 py-6 text-xs text-ink-faint sm:px-6">Sinewright — checked calculations for power electronics.</div>
      </footer>
    </div>
  );
}
