import { describe, expect, it } from "vitest";
import { pageText, teamWithRoles, type Visitor } from "../support/http";
import { waitForMail } from "../support/mail";
import { serverQuery } from "../support/server-db";

const SOURCE = `## DC link

<DcLink id="dc1" p="3 kW" vdc="400 V" f="50 Hz" rippleVpp="8 V" />
`;

async function sheetWithRevision(author: Visitor, title: string, source = SOURCE) {
  const created = await author.postForm("/sheets/new", { title, projectId: "", tags: "" });
  const label = created.headers.get("location")!.split("/")[2]!;
  const saved = await author.postForm(`/sheets/${label}/edit`, { intent: "save", source, baseRevisionId: "", note: "" });
  expect(saved.status).toBe(302);
  return label;
}

async function latestRevision(teamId: string, label: string) {
  const [row] = await serverQuery<{ id: string; state: string; label: string }>(
    `select r.id, r.state, r.label from sheet_revision r join calc_sheet s on s.latest_revision_id = r.id where s.team_id = $1 and s.number = $2`,
    [teamId, Number(label.slice(3))],
  );
  return row!;
}

describe("peer check", () => {
  it("runs the whole loop: submit, comment, return, revise, resubmit, re-run with own inputs, stamp — with mail at each step", async () => {
    const { teamId, people } = await teamWithRoles("loop", ["engineer", "checker"]);
    const author = people.engineer!;
    const checker = people.checker!;
    const label = await sheetWithRevision(author.visitor, "DC link for the loop test");

    const submit = await author.visitor.postForm(`/sheets/${label}`, { intent: "submit", checkerId: checker.userId });
    expect(submit.status).toBe(200);
    expect(await submit.text()).toContain("is sent for checking");
    await waitForMail(checker.email, /Check requested: .* rev A/);
    expect(await pageText(await checker.visitor.get("/desk"))).toContain(`${label} rev A`);

    // Returning needs a comment first.
    const bare = await checker.visitor.postForm(`/sheets/${label}`, { intent: "return" });
    expect(bare.status).toBe(400);
    expect(await bare.text()).toContain("Write at least one comment");
    expect((await checker.visitor.postForm(`/sheets/${label}`, { intent: "comment", anchor: "block:dc1", body: "Ripple of 8 V is tight for this capacitor bank; use 10 V." })).status).toBe(200);
    expect((await checker.visitor.postForm(`/sheets/${label}`, { intent: "return" })).status).toBe(200);
    await waitForMail(author.email, /Returned with comments: .* rev A/);
    expect((await latestRevision(teamId, label)).state).toBe("returned");

    // The author answers, then revises to B and resubmits.
    const [thread] = await serverQuery<{ id: string }>(`select id from review_comment where parent_id is null and sheet_id = (select sheet_id from sheet_revision where id = $1)`, [(await latestRevision(teamId, label)).id]);
    expect((await author.visitor.postForm(`/sheets/${label}`, { intent: "comment", anchor: "block:dc1", body: "Agreed, changed in B.", parentId: thread!.id })).status).toBe(200);
    await waitForMail(checker.email, /Reply on .* rev A/);
    const revA = await latestRevision(teamId, label);
    const saveB = await author.visitor.postForm(`/sheets/${label}/edit`, { intent: "save", source: SOURCE.replace("8 V", "10 V"), baseRevisionId: revA.id, note: "ripple 10 V" });
    expect(saveB.status).toBe(302);
    const revB = await latestRevision(teamId, label);
    expect(revB.label).toBe("B");
    expect((await author.visitor.postForm(`/sheets/${label}`, { intent: "submit", checkerId: checker.userId })).status).toBe(200);
    await waitForMail(checker.email, /Check requested: .* rev B/);

    // The checker re-runs dc1 with their own inputs (same physics, other spellings) and stamps.
    const check = await checker.visitor.postForm(`/sheets/${label}`, {
      intent: "check-values",
      blockId: "dc1",
      "input.p": "3000 W",
      "input.vdc": "0.4 kV",
      "input.f": "50 Hz",
      "input.rippleVpp": "10 V",
      tolerancePercent: "0.5",
    });
    expect(check.status).toBe(200);
    expect(await check.text()).toContain("agrees with the author");
    const stamp = await checker.visitor.postForm(`/sheets/${label}`, { intent: "stamp" });
    expect(stamp.status).toBe(200);
    await waitForMail(author.email, /Verified: .* rev B/);

    const page = await (await author.visitor.get(`/sheets/${label}`)).text();
    expect(page).toContain("Verified by");
    expect(page).not.toContain("Integrity check failed");
    const [stored] = await serverQuery<{ content_hash: string; revision_hash: string }>(
      `select st.content_hash, r.content_hash as revision_hash from stamp st join sheet_revision r on r.id = st.revision_id where r.id = $1`,
      [revB.id],
    );
    expect(stored!.content_hash).toBe(stored!.revision_hash);
  });

  it("refuses a self-check and stamps by engineers or viewers (403)", async () => {
    const { people } = await teamWithRoles("rules", ["engineer", "checker", "viewer"]);
    const label = await sheetWithRevision(people.checker!.visitor, "Written by a checker");
    const self = await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "submit", checkerId: people.checker!.userId });
    expect(self.status).toBe(400);
    expect(await self.text()).toContain("nobody checks their own calculation");
    expect((await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "submit", checkerId: people.admin!.userId })).status).toBe(200);
    expect((await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" })).status).toBe(403);
    expect((await people.engineer!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" })).status).toBe(403);
    expect((await people.viewer!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" })).status).toBe(403);
    expect((await people.admin!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" })).status).toBe(200);
  });

  it("gives exactly one stamp when two checkers stamp at once, and tells the other clearly", async () => {
    const { teamId, people } = await teamWithRoles("race", ["engineer", "checker1", "checker2"]);
    const label = await sheetWithRevision(people.engineer!.visitor, "Raced");
    await people.engineer!.visitor.postForm(`/sheets/${label}`, { intent: "submit", checkerId: people.checker1!.userId });
    const [a, b] = await Promise.all([
      people.checker1!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" }),
      people.checker2!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const loser = a.status === 409 ? a : b;
    expect(await loser.text()).toContain("was already verified by");
    const stamps = await serverQuery(`select 1 from stamp where revision_id = $1`, [(await latestRevision(teamId, label)).id]);
    expect(stamps).toHaveLength(1);
  });

  it("has the database refuse any change to a verified revision, and shows a loud warning when its content no longer matches the hash", async () => {
    const { teamId, people } = await teamWithRoles("tamper", ["engineer", "checker"]);
    const label = await sheetWithRevision(people.engineer!.visitor, "Tamper target");
    await people.engineer!.visitor.postForm(`/sheets/${label}`, { intent: "submit", checkerId: people.checker!.userId });
    expect((await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" })).status).toBe(200);
    const revision = await latestRevision(teamId, label);

    await expect(serverQuery(`update sheet_revision set source = source || ' ' where id = $1`, [revision.id])).rejects.toThrow(/verified and cannot be changed/);
    await expect(serverQuery(`update sheet_revision set state = 'draft' where id = $1`, [revision.id])).rejects.toThrow(/verified and cannot be changed/);
    await expect(serverQuery(`delete from sheet_revision where id = $1`, [revision.id])).rejects.toThrow(/permanent/);
    await expect(serverQuery(`update revision_block set inputs = '{}' where revision_id = $1`, [revision.id])).rejects.toThrow(/append-only/);
    await expect(serverQuery(`delete from stamp where revision_id = $1`, [revision.id])).rejects.toThrow(/append-only/);

    // Someone with database rights disables the guard and edits the stored input.
    await serverQuery(`alter table revision_block disable trigger revision_block_frozen`);
    try {
      await serverQuery(`update revision_block set inputs = jsonb_set(inputs, '{rippleVpp}', '"4 V"') where revision_id = $1`, [revision.id]);
    } finally {
      await serverQuery(`alter table revision_block enable trigger revision_block_frozen`);
    }
    const page = await (await people.engineer!.visitor.get(`/sheets/${label}`)).text();
    expect(page).toContain("Integrity check failed");
    expect(page).toContain("the verification stamp is void");
    expect(page).toContain("Stamp void");
  });
});
