import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { describeViolations, openBrowser, seriousAccessibilityViolations, signInThroughPage, type BrowserSession } from "../support/browser";
import { BASE_URL, teamWithRoles } from "../support/http";
import { waitForMail } from "../support/mail";

let author: BrowserSession;
let checker: BrowserSession;
beforeAll(async () => {
  [author, checker] = await Promise.all([openBrowser(), openBrowser()]);
});
afterAll(async () => {
  await Promise.all([author?.close(), checker?.close()]);
});

const SOURCE = `## Output filter

<LcFilter id="lc1" l="1.5 mH" c="10 uF" rLoad="17.6 ohm" fsw="20 kHz" f="50 Hz" vout="230 V" />
`;

describe("checking a sheet in the browser", () => {
  it("submits, comments, revises, re-runs with the checker's own inputs and stamps, with an e-mail at each step", async () => {
    const { people } = await teamWithRoles("e2e-check", ["engineer", "checker"]);
    const engineer = people.engineer!;
    const reviewer = people.checker!;
    const password = "correct-horse-battery";

    // The author writes revision A through the form endpoints, then works in the browser.
    const created = await engineer.visitor.postForm("/sheets/new", { title: "Filter for review", projectId: "", tags: "" });
    const label = created.headers.get("location")!.split("/")[2]!;
    expect((await engineer.visitor.postForm(`/sheets/${label}/edit`, { intent: "save", source: SOURCE, baseRevisionId: "", note: "" })).status).toBe(302);

    await signInThroughPage(author.page, engineer.email, password);
    await author.page.goto(`${BASE_URL}/sheets/${label}`);
    await author.page.getByLabel("Send for checking to").selectOption({ label: `Test e2e-check-checker (checker)` });
    await author.page.getByRole("button", { name: "Send for checking" }).click();
    await author.page.getByText("is sent for checking").waitFor();
    await waitForMail(reviewer.email, /Check requested: .* rev A/);

    await signInThroughPage(checker.page, reviewer.email, password);
    await checker.page.goto(`${BASE_URL}/desk`);
    await checker.page.getByRole("link", { name: `${label} rev A` }).click();
    await checker.page.getByLabel("Comment on").selectOption("block:lc1");
    await checker.page.getByLabel("Comment", { exact: true }).fill("Corner is close to the 20th harmonic; lower L·C a little.");
    await checker.page.getByRole("button", { name: "Add comment" }).click();
    await checker.page.getByText("Comment added.").waitFor();
    const violations = await seriousAccessibilityViolations(checker.page);
    expect(violations, describeViolations(violations)).toEqual([]);
    await checker.page.getByRole("button", { name: "Return with comments" }).click();
    await checker.page.getByText("is returned to its author").waitFor();
    await waitForMail(engineer.email, /Returned with comments/);

    // Revision B in the editor, then resubmit.
    await author.page.goto(`${BASE_URL}/sheets/${label}/edit`);
    await author.page.locator('section[data-block-id="lc1"]').getByLabel(/Capacitance/).fill("6.8 uF");
    await author.page.getByLabel("What changed (revision note)").fill("C lowered to 6.8 uF after review");
    await author.page.getByRole("button", { name: "Save as new revision" }).click();
    await author.page.waitForURL(`**/sheets/${label}`);
    await author.page.getByLabel("Send for checking to").selectOption({ label: `Test e2e-check-checker (checker)` });
    await author.page.getByRole("button", { name: "Send for checking" }).click();
    await author.page.getByText("is sent for checking").waitFor();
    await waitForMail(reviewer.email, /Check requested: .* rev B/);

    // The checker re-runs the filter with their own spelling of the inputs, then stamps.
    await checker.page.goto(`${BASE_URL}/sheets/${label}`);
    await checker.page.getByText(/Re-run lc1/).click();
    await checker.page.getByLabel("c", { exact: true }).fill("6800 nF");
    await checker.page.getByRole("button", { name: "Run and record" }).click();
    await checker.page.getByText("agrees with the author's results").waitFor();
    await checker.page.getByRole("button", { name: "Verify and stamp revision B" }).click();
    await checker.page.getByText("is verified and stamped").waitFor();
    await waitForMail(engineer.email, /Verified: .* rev B/);

    await author.page.goto(`${BASE_URL}/sheets/${label}`);
    const stamp = author.page.getByRole("img", { name: /Verified by Test e2e-check-checker/ });
    expect(await stamp.count()).toBe(1);
    expect(author.pageErrors).toEqual([]);
    expect(checker.pageErrors).toEqual([]);
  });
});
