import katex from "katex";
import { useLoaderData } from "react-router";
import type { Route } from "./+types/calculators";
import { HardwareCaution } from "~/components/caution";
import { PageHeader } from "~/components/empty-state";
import { ScrollRegion } from "~/components/scroll-region";
import { catalogue } from "~/lib/calc/registry";
import type { InputSpec } from "~/lib/calc/types";
import { describeRange } from "~/lib/calc/units";
import { blockSnippet, componentNameOf, nextBlockId } from "~/lib/mdx";
import { requireMember } from "~/.server/access";

export const meta: Route.MetaFunction = () => [{ title: "Calculators · Sinewright" }];

function inputSummary(spec: InputSpec): { kind: string; unit: string; range: string; default: string } {
  switch (spec.kind) {
    case "quantity":
      return { kind: spec.dimension, unit: spec.displayUnit, range: [describeRange(spec), spec.integer ? "whole number" : ""].filter(Boolean).join("; "), default: spec.default ?? "" };
    case "quantityList":
      return { kind: `list of ${spec.dimension}`, unit: spec.displayUnit, range: describeRange(spec) ?? "", default: spec.default ?? "" };
    case "choice":
      return { kind: "choice", unit: "", range: spec.options.map((o) => o.value).join(" | "), default: spec.default ?? "" };
    case "spectrum":
      return { kind: "spectrum", unit: "", range: "list of {n, value}, or =block.harmonics", default: spec.default ?? "" };
    case "expression":
      return { kind: "expression", unit: "", range: "arithmetic with units and block outputs", default: spec.default ?? "" };
  }
}

/** The reference for every calculator, generated from the registry so it cannot drift from the engine. */
export async function loader({ request, context }: Route.LoaderArgs) {
  await requireMember(request, context, "viewer");
  const { engineVersion, calculators } = catalogue();
  return {
    engineVersion,
    calculators: calculators.map((c) => ({
      ...c,
      component: componentNameOf(c.id),
      snippet: blockSnippet(c.id, nextBlockId(c.id, [])),
      inputs: c.inputs.map((i) => ({ key: i.key, label: i.label, description: i.description, optional: Boolean(i.optional), ...inputSummary(i) })),
      formulas: c.formulas.map((f) => ({ label: f.label, html: katex.renderToString(f.latex, { displayMode: true, throwOnError: false, output: "htmlAndMathml" }) })),
    })),
  };
}

export default function Calculators() {
  const { engineVersion, calculators } = useLoaderData<typeof loader>();
  return (
    <div>
      <PageHeader eyebrow={`Engine ${engineVersion}`} title="Calculators" />
      <p className="max-w-3xl text-ink-soft">
        Every calculator a calc sheet can hold, with its inputs, outputs, formulas, conventions and published sources. Type
        quantities as you would write them — <code>48 V</code>, <code>4.7 uF</code>, <code>2.2mH</code>, <code>20 kHz</code>,{" "}
        <code>30°</code>. Any input may instead reference another block's result, such as <code>=qs1.v1Rms</code>.
      </p>
      <section aria-labelledby="rules-heading" className="panel mt-6 max-w-3xl p-5">
        <h2 id="rules-heading" className="font-semibold">
          How inputs are read
        </h2>
        <ul className="mt-2 list-disc space-y-1.5 pl-5 text-sm leading-relaxed text-ink-soft">
          <li>
            <strong>Units are required.</strong> A quantity with a dimension needs its unit. A bare number — typed, or a JSON number
            sent to the API — is refused with its readings spelled out: <code>c = 4.7e-6</code> gives “4.7e-6 has no unit: did you mean
            4.7 µF?”. Only inputs listed below as <em>dimensionless</em> (ma, mf, pf, hmax, Isc/IL …) take bare numbers.
          </li>
          <li>
            <strong>Spellings.</strong> A unit in another case or with a trade habit — <code>20 KHz</code>, <code>48 v</code>,{" "}
            <code>10 Ohm</code>, <code>4.7 uf</code>, <code>48 VDC</code>, <code>30º</code>, <code>60hz</code> — is read when exactly one
            unit of the input's dimension matches, and the block says how it read it. Where milli and mega could be confused (
            <code>mv</code>/<code>MV</code>, <code>mhz</code>/<code>MHZ</code>) it is refused: write the unit exactly. Apparent power (
            <code>kVA</code>) is not accepted where real power (W) is asked for.
          </li>
          <li>
            <strong>Empty inputs.</strong> An input left out or left empty takes the default shown below, and the block lists it under
            “Default used”. An input with no default must be given.
          </li>
          <li>
            <strong>Lists.</strong> Separate items with a comma and a space and write decimals with a point. <code>9,59 deg</code> has
            two readings (9.59° or 9° and 59°) and is refused.
          </li>
          <li>
            <strong>Limit checks.</strong> A verdict needs the whole range the table limits (IEEE Std 519-2014 to order 50, IEC
            61000-3-2 to order 40): a referenced spectrum reaches its block's hmax, a typed one its highest order or{" "}
            <code>listedTo</code>. Current tables refuse voltage spectra. Interharmonics and limits entered from memory give no verdict.
          </li>
        </ul>
      </section>
      <section aria-labelledby="thd-heading" className="panel mt-6 max-w-3xl p-5">
        <h2 id="thd-heading" className="font-semibold">
          Why three THD figures
        </h2>
        <p className="mt-2 text-sm leading-relaxed text-ink-soft">
          THD here is always relative to the fundamental (THD<sub>F</sub>, as IEEE Std 519 defines it). <strong>thd</strong> covers every
          harmonic — exact, from the waveform's RMS where that is known in closed form. <strong>thd40</strong> and{" "}
          <strong>thd50</strong> sum only the orders up to 40 and 50, as IEC and IEEE measurements do. For a switched waveform the
          three differ because energy above the 50th order (switching sidebands, in PWM) counts in the first but not in the others;
          compliance limits are stated over the truncated sums.
        </p>
      </section>
      <nav aria-label="Calculators on this page" className="mt-6">
        <ul className="flex flex-wrap gap-2 text-sm">
          {calculators.map((c) => (
            <li key={c.id}>
              <a className="rounded-full border border-rule bg-sheet px-3 py-1 no-underline hover:border-copper" href={`#${c.id}`}>
                {c.title}
              </a>
            </li>
          ))}
        </ul>
      </nav>
      <div className="mt-8 space-y-10">
        {calculators.map((c) => (
          <article key={c.id} id={c.id} aria-labelledby={`${c.id}-title`} className="panel scroll-mt-6 p-5 sm:p-6">
            <p className="font-mono text-xs text-ink-faint">{c.id}</p>
            <h2 id={`${c.id}-title`} className="font-serif text-2xl font-semibold">
              {c.title}
            </h2>
            <p className="mt-1 text-ink-soft">{c.summary}</p>
            <p className="prose-sheet mt-3 max-w-3xl text-[15px]">{c.description}</p>
            <h3 className="mt-6 font-semibold">In a calc sheet</h3>
            <p className="mt-1 text-sm text-ink-soft">
              Write it as <code className="font-mono">&lt;{c.component} /&gt;</code> with an <code>id</code> and any inputs as quoted strings; the editor's palette
              inserts it with the defaults below.
            </p>
            <ScrollRegion label={`Component for ${c.title}`} className="mt-2 rounded-md border border-rule bg-paper">
              <pre className="p-3 font-mono text-xs">{c.snippet}</pre>
            </ScrollRegion>

            <h3 className="mt-6 font-semibold">Inputs</h3>
            <ScrollRegion label={`Inputs of ${c.title}`} className="mt-2">
              <table className="w-full min-w-[36rem] text-left text-sm">
                <thead className="text-ink-faint">
                  <tr className="border-b border-rule">
                    <th className="py-1.5 pr-3 font-medium">Key</th>
                    <th className="py-1.5 pr-3 font-medium">Meaning</th>
                    <th className="py-1.5 pr-3 font-medium">Kind and unit</th>
                    <th className="py-1.5 pr-3 font-medium">Allowed</th>
                    <th className="py-1.5 font-medium">Default</th>
                  </tr>
                </thead>
                <tbody>
                  {c.inputs.map((i) => (
                    <tr key={i.key} className="border-b border-rule align-top last:border-0">
                      <td className="py-1.5 pr-3 font-mono">{i.key}</td>
                      <td className="py-1.5 pr-3">
                        {i.label}
                        {i.optional ? <span className="text-ink-faint"> (optional)</span> : null}
                        <span className="block text-xs text-ink-faint">{i.description}</span>
                      </td>
                      <td className="py-1.5 pr-3">
                        {i.kind}
                        {i.unit ? `, ${i.unit}` : ""}
                      </td>
                      <td className="py-1.5 pr-3">{i.range}</td>
                      <td className="py-1.5 font-mono">{i.default}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollRegion>

            <h3 className="mt-6 font-semibold">Outputs</h3>
            <ul className="mt-2 grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
              {c.outputs.map((o) => (
                <li key={o.key}>
                  <span className="font-mono">{o.key}</span> — {o.label}
                  {o.unit ? <span className="text-ink-faint"> [{o.unit}]</span> : null}
                </li>
              ))}
            </ul>

            {c.formulas.length > 0 ? (
              <>
                <h3 className="mt-6 font-semibold">Formulas</h3>
                <dl className="formula-list mt-2 space-y-2">
                  {c.formulas.map((f) => (
                    <div key={f.label} className="grid gap-1 sm:grid-cols-[14rem_1fr] sm:items-center">
                      <dt className="text-sm text-ink-soft">{f.label}</dt>
                      <dd className="min-w-0">
                        <ScrollRegion label={f.label}>
                          <div dangerouslySetInnerHTML={{ __html: f.html }} />
                        </ScrollRegion>
                      </dd>
                    </div>
                  ))}
                </dl>
              </>
            ) : null}

            {c.conventions.length > 0 ? (
              <>
                <h3 className="mt-6 font-semibold">Conventions</h3>
                <ul className="mt-2 list-disc space-y-1 pl-5 text-sm">
                  {c.conventions.map((t) => (
                    <li key={t}>{t}</li>
                  ))}
                </ul>
              </>
            ) : null}

            <h3 className="mt-6 font-semibold">Sources</h3>
            <ul className="mt-2 list-disc space-y-1 pl-5 text-sm text-ink-soft">
              {c.sources.map((t) => (
                <li key={t}>{t}</li>
              ))}
            </ul>
            {c.cautions.length > 0 ? (
              <ul className="mt-4 space-y-1 text-sm text-[#5e480a]">
                {c.cautions.map((t) => (
                  <li key={t}>⚠ {t}</li>
                ))}
              </ul>
            ) : null}
          </article>
        ))}
      </div>
      <div className="mt-10">
        <HardwareCaution />
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
