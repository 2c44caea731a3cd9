import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { describeViolations, openBrowser, seriousAccessibilityViolations, signInThroughPage, type BrowserSession } from "../support/browser";
import { BASE_URL, teamWithRoles, type Visitor } from "../support/http";

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

/** Saves the next revision through the form endpoint, sends it to the checker and has it stamped. */
async function verifiedRevision(authorVisitor: Visitor, checkerVisitor: Visitor, checkerId: string, label: string, source: string, baseRevisionId: string) {
  expect((await authorVisitor.postForm(`/sheets/${label}/edit`, { intent: "save", source, baseRevisionId, note: "" })).status).toBe(302);
  expect((await authorVisitor.postForm(`/sheets/${label}`, { intent: "submit", checkerId })).status).toBe(200);
  expect((await checkerVisitor.postForm(`/sheets/${label}`, { intent: "stamp" })).status).toBe(200);
}

describe("citing a checked sheet in a project document", () => {
  it("shows the citation superseded once a newer revision is verified, and the project panel's update brings it to that revision", async () => {
    const { people } = await teamWithRoles("e2e-cite", ["engineer", "checker"]);
    const engineer = people.engineer!;
    const reviewer = people.checker!;
    const password = "correct-horse-battery";
    const code = `CITE-${Date.now().toString(36).toUpperCase()}`;
    expect((await engineer.visitor.postForm("/projects", { code, name: "Citation loop", client: "", description: "" })).status).toBe(302);
    const created = await engineer.visitor.postForm("/sheets/new", { title: "Output filter for the report", projectId: "", tags: "" });
    const label = created.headers.get("location")!.split("/")[2]!;
    // Revisions A and B, both verified, written through the form endpoints.
    await verifiedRevision(engineer.visitor, reviewer.visitor, reviewer.userId, label, SOURCE, "");
    const revA = /name="baseRevisionId" value="([^"]+)"/.exec(await (await engineer.visitor.get(`/sheets/${label}/edit`)).text())![1]!;
    await verifiedRevision(engineer.visitor, reviewer.visitor, reviewer.userId, label, SOURCE.replace("10 uF", "8.2 uF"), revA);

    // The author writes the document in the browser, citing B from the palette.
    await signInThroughPage(author.page, engineer.email, password);
    await author.page.goto(`${BASE_URL}/projects/${code}`);
    await author.page.getByRole("link", { name: "New document" }).click();
    await author.page.getByLabel("Title").fill("Design report, output filter");
    await author.page.getByRole("button", { name: "Create and start writing" }).click();
    await author.page.waitForURL("**/documents/*/edit");
    const documentLabel = /\/documents\/([^/]+)\/edit/.exec(author.page.url())![1]!;
    const editor = author.page.getByLabel("Document source (MDX)");
    await editor.click();
    await author.page.keyboard.press("Control+End");
    await author.page.keyboard.type("The filter is sized in ");
    await author.page.getByLabel("Find a sheet").fill(label);
    await author.page.getByRole("button", { name: `Cite rev B (verified) of ${label}` }).click();
    await author.page.getByRole("region", { name: "Live preview" }).getByText(`${label} rev B`).first().waitFor();
    await author.page.getByLabel("What changed (version note)").fill("First issue");
    await author.page.getByRole("button", { name: "Save version 1" }).click();
    await author.page.waitForURL(`**/documents/${documentLabel}`);
    const references = author.page.getByRole("region", { name: "References" });
    await references.getByText(`${label} rev B`).waitFor();
    expect(await references.textContent()).toContain("Verified");

    // The author makes revision C in the editor; the checker stamps it in the browser.
    await author.page.goto(`${BASE_URL}/sheets/${label}/edit`);
    await author.page.locator('section[data-block-id="lc1"]').getByLabel(/Capacitance/).fill("6.8 uF");
    await author.page.getByLabel("What changed (revision note)").fill("C lowered to 6.8 uF");
    await author.page.getByRole("button", { name: "Save as new revision" }).click();
    await author.page.waitForURL(`**/sheets/${label}`);
    await author.page.getByLabel("Send for checking to").selectOption({ label: `Test e2e-cite-checker (checker)` });
    await author.page.getByRole("button", { name: "Send for checking" }).click();
    await author.page.getByText("is sent for checking").waitFor();
    await signInThroughPage(checker.page, reviewer.email, password);
    await checker.page.goto(`${BASE_URL}/sheets/${label}`);
    await checker.page.getByRole("button", { name: "Verify and stamp revision C" }).click();
    await checker.page.getByText("is verified and stamped").waitFor();

    // The document now shows the citation as superseded …
    await author.page.goto(`${BASE_URL}/documents/${documentLabel}`);
    await references.getByText("superseded by revision C (verified)").waitFor();
    let violations = await seriousAccessibilityViolations(author.page);
    expect(violations, describeViolations(violations)).toEqual([]);

    // … and the project panel offers the update.
    await author.page.goto(`${BASE_URL}/projects/${code}`);
    const panel = author.page.getByRole("region", { name: "Citations needing attention" });
    await panel.getByText(`cites ${label} rev B`).waitFor();
    violations = await seriousAccessibilityViolations(author.page);
    expect(violations, describeViolations(violations)).toEqual([]);
    await panel.getByRole("button", { name: `Update to rev C in ${documentLabel}` }).click();
    await author.page.getByText(`${documentLabel} now cites ${label} rev C (was B)`).waitFor();
    await panel.getByText("Every citation in this project's documents points at a verified revision").waitFor();

    await author.page.goto(`${BASE_URL}/documents/${documentLabel}`);
    await references.getByText(`${label} rev C`).waitFor();
    const text = (await references.textContent()) ?? "";
    expect(text).toContain("Verified");
    expect(text).not.toContain("superseded");
    await author.page.screenshot({ path: "test-results/document-after-update.png", fullPage: true });
  });
});
