// The server typesets authors' formulas in a worker with a deadline, so a formula that
// gets past the check can hold only that worker, never the requests of the process.
import { describe, expect, it } from "vitest";
import { prepareUntrustedSheet, typesetInWorker } from "~/.server/math-typesetter";
import { checkSheetSource } from "~/lib/mdx";

// Would be refused by the check; sent straight to the worker, it runs for about a minute.
const SLOW_FORMULA = `\\def\\a{${"x+".repeat(500)}}${"\\a".repeat(199)}`;

describe("typesetting in a worker", () => {
  it("typesets a sheet's formulas exactly as the browser does", async () => {
    const source = "# Filter\n\nCorner $f_0 = \\frac{1}{2\\pi\\sqrt{LC}}$.\n\n$$\nv = L\\frac{di}{dt}\n$$\n\n```math\nx^2\n```\n";
    const inBrowser = checkSheetSource(source);
    const onServer = await prepareUntrustedSheet(source);
    if (!inBrowser.ok || !onServer.ok) throw new Error("the sheet should pass");
    expect(onServer.tree).toEqual(inBrowser.tree);
    expect(JSON.stringify(onServer.tree)).toContain("katex-display");
  });

  it("stops a formula past its deadline, says which one, and typesets the next sheet in a fresh worker", async () => {
    const outcome = await typesetInWorker(
      [
        { tex: "x^2", displayMode: false },
        { tex: SLOW_FORMULA, displayMode: true },
      ],
      300,
    );
    expect(outcome).toMatchObject({ ok: false, failedAt: 1 });
    const next = await typesetInWorker([{ tex: "\\alpha", displayMode: false }]);
    expect(next.ok && next.html[0]).toContain("α");
  });

  it("keeps the process answering while a worker is busy", async () => {
    const busy = typesetInWorker([{ tex: SLOW_FORMULA, displayMode: false }], 1_000);
    // The main thread still reaches its next turn while the worker typesets (typeset here, the formula would finish first).
    const tick = new Promise<string>((resolve) => setImmediate(() => resolve("timer")));
    expect(await Promise.race([tick, busy.then(() => "typesetting")])).toBe("timer");
    expect(await busy).toMatchObject({ ok: false, failedAt: 0 });
  });
});
