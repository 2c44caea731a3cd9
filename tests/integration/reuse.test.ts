import { describe, expect, it } from "vitest";
import { pageText, Visitor } from "../support/http";
import { serverQuery } from "../support/server-db";

describe("reusing a revision in another project", () => {
  it("creates a new unsaved sheet with the source and inputs copied and lineage shown on both sheets", async () => {
    const engineer = await new Visitor().signIn("engineer@example.com");
    const [ups] = await serverQuery<{ id: string }>(`select id from project where code = 'UPS-48'`);
    const reuse = await engineer.postForm("/sheets/CS-0002/revisions/B", { intent: "reuse", projectId: ups!.id });
    expect(reuse.status).toBe(302);
    const target = reuse.headers.get("location")!;
    expect(target).toMatch(/^\/sheets\/CS-\d{4}\/edit$/);
    const label = target.split("/")[2]!;

    const editor = await engineer.get(target);
    expect(editor.status).toBe(200);
    expect(await editor.text()).toContain("rippleVpp=&quot;12 V&quot;");

    const copy = await pageText(await engineer.get(`/sheets/${label}`));
    expect(copy).toContain("Derived from");
    expect(copy).toContain("CS-0002 rev B");
    expect(copy).toContain("Nothing saved yet");
    const original = await pageText(await engineer.get("/sheets/CS-0002"));
    expect(original).toContain("Reused in:");
    expect(original).toContain(label);

    const viewer = await new Visitor().signIn("viewer@example.com");
    expect((await viewer.postForm("/sheets/CS-0002/revisions/B", { intent: "reuse", projectId: "" })).status).toBe(403);
  });
});
