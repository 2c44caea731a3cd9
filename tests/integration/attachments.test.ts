// Attachments over HTTP against the running test server, which stores bytes in the fake
// S3 service: uploads, downloads only within the team, bad files refused with their
// message and nothing left behind, and measured blocks saved with the revision.
import { request as httpRequest } from "node:http";
import { describe, expect, it } from "vitest";
import { S3ObjectStore } from "../../app/.server/storage";
import { captureCsv, quasiSquare } from "../support/capture-synth";
import { BASE_URL, pageText, signUpWithTeam, Visitor } from "../support/http";
import { serverQuery } from "../support/server-db";

const deg = Math.PI / 180;

function bucket() {
  return new S3ObjectStore({
    endpoint: process.env.S3_ENDPOINT!,
    bucket: process.env.S3_BUCKET!,
    region: process.env.S3_REGION ?? "us-east-1",
    accessKeyId: process.env.S3_ACCESS_KEY_ID!,
    secretAccessKey: process.env.S3_SECRET_ACCESS_KEY!,
  });
}

async function teamWithSheet(label: string) {
  const { visitor } = await signUpWithTeam(label);
  const created = await visitor.postForm("/sheets/new", { title: `Bench checks ${label}`, projectId: "", tags: "bench" });
  expect(created.status).toBe(302);
  const sheet = created.headers.get("location")!.split("/")[2]!;
  const [team] = await serverQuery<{ id: string }>(`select id from organization where name = $1`, [`Team ${label}`]);
  return { visitor, sheet, teamId: team!.id };
}

function upload(visitor: Visitor, sheet: string, name: string, body: BodyInit, headers: Record<string, string> = {}) {
  return visitor.request(`/api/v1/sheets/${sheet}/attachments?name=${encodeURIComponent(name)}`, {
    method: "POST",
    body,
    headers: { "content-type": "application/octet-stream", ...headers },
  });
}

/** Nothing of the sheet's uploads is left: no row, no object in the store. */
async function expectNothingStored(teamId: string) {
  const rows = await serverQuery(`select id from attachment where team_id = $1`, [teamId]);
  expect(rows).toEqual([]);
  expect(await bucket().list(`teams/${teamId}/`)).toEqual([]);
}

const benchCapture = captureCsv({
  sampleRate: 50_000,
  samples: 10_000,
  seed: 5,
  preamble: ["Invented bench export"],
  channels: [{ name: "Vout", unit: "V", valueAt: quasiSquare(48, 30 * deg, 50, 0.7), noise: 0.2 }],
});

describe("attachments: upload and download", () => {
  it("stores a capture with its analysis, lists it, and streams it back to members as a download", async () => {
    const { visitor, sheet, teamId } = await teamWithSheet("attach");
    const response = await upload(visitor, sheet, "../scope/bench 01.CSV", benchCapture);
    expect(response.status).toBe(201);
    const { attachment } = (await response.json()) as { attachment: { id: string; fileName: string; contentType: string; size: number; sha256: string; channels: { name: string; thd: number }[]; url: string } };
    expect(attachment).toMatchObject({ fileName: "bench 01.csv", contentType: "text/csv", size: Buffer.byteLength(benchCapture) });
    expect(attachment.channels.map((c) => c.name)).toEqual(["Vout"]);
    // Quasi-square at 30°: THD √(π²/9 − 1) = 31.08 % (derived from Vrms = Vdc·√(1 − 2α/π) and V1 = (4·Vdc/π)·cos α,
    // Rashid, Power Electronics, 3rd ed., §6.6 — published; section from memory); sampling and noise move it a little.
    expect(attachment.channels[0]!.thd).toBeGreaterThan(30.85);
    expect(attachment.channels[0]!.thd).toBeLessThan(31.3);
    expect(await bucket().list(`teams/${teamId}/`)).toEqual([`teams/${teamId}/attachments/${attachment.id}`]);

    const listed = (await (await visitor.get(`/api/v1/sheets/${sheet}/attachments`)).json()) as { attachments: { id: string }[] };
    expect(listed.attachments.map((a) => a.id)).toEqual([attachment.id]);

    const download = await visitor.get(attachment.url);
    expect(download.status).toBe(200);
    expect(download.headers.get("content-type")).toMatch(/^text\/csv(; charset=utf-8)?$/);
    expect(download.headers.get("content-disposition")).toBe(`attachment; filename="bench 01.csv"; filename*=UTF-8''bench%2001.csv`);
    expect(await download.text()).toBe(benchCapture);

    // The same name again gets a numbered name, not a replaced file.
    const again = (await (await upload(visitor, sheet, "bench 01.csv", benchCapture)).json()) as { attachment: { fileName: string } };
    expect(again.attachment.fileName).toBe("bench 01 (2).csv");
  });

  it("lets no one outside the team download or list it: another team's member gets 404, an anonymous visitor is sent to sign in", async () => {
    const { visitor, sheet } = await teamWithSheet("owner");
    const { attachment } = (await (await upload(visitor, sheet, "datasheet.pdf", "%PDF-1.4\n1 0 obj\n<<>>\nendobj\n%%EOF\n")).json()) as { attachment: { url: string } };
    const { visitor: outsider } = await signUpWithTeam("outsider");
    expect((await outsider.get(attachment.url)).status).toBe(404);
    expect((await outsider.get(`/api/v1/sheets/${sheet}/attachments`)).status).toBe(404);
    const anonymous = await new Visitor().get(attachment.url);
    expect(anonymous.status).toBe(302);
    expect(anonymous.headers.get("location")).toMatch(/^\/sign-in\?next=/);
    expect((await new Visitor().get(`/api/v1/sheets/${sheet}/attachments`)).status).toBe(401);
  });

  it("lets a viewer download the demo capture but not upload", async () => {
    const [demo] = await serverQuery<{ number: number; id: string }>(
      `select s.number, a.id from attachment a join calc_sheet s on s.id = a.sheet_id where a.file_name = 'ups48-bench-48v6.csv'`,
    );
    expect(demo).toBeDefined();
    const viewer = await new Visitor().signIn("viewer@example.com");
    const label = `CS-${String(demo!.number).padStart(4, "0")}`;
    const download = await viewer.get(`/sheets/${label}/attachments/${demo!.id}`);
    expect(download.status).toBe(200);
    expect((await download.text()).split("\n")[0]).toBe("Larkfield Power Systems bench capture (invented demo data)");
    const refused = await upload(viewer, label, "mine.csv", "t,v\n0,1\n");
    expect(refused.status).toBe(403);
  });
});

describe("attachments: bad files are refused with what to fix, and nothing is stored", () => {
  const cases: [string, string, BodyInit, number, RegExp][] = [
    ["an empty file", "empty.csv", "", 400, /The file is empty/],
    ["non-numeric rows", "labels.csv", "Time,Vout\n0,1\n0.001,2\n0.002,overload\n", 400, /Line 4, column 2 \("Vout"\): "overload" is not a number/],
    ["a single column", "one.csv", "Vout\n1\n2\n3\n4\n5\n6\n7\n8\n9\n10\n11\n12\n13\n14\n15\n16\n", 400, /Line 2 holds a single column/],
    ["time not increasing", "backwards.csv", "t,v\n0,1\n0.001,2\n0.0005,3\n", 400, /Line 4: time 0.0005 is not after the previous sample's 0.001/],
    [
      "too short to hold one cycle",
      "short.csv",
      captureCsv({ sampleRate: 10_000, samples: 100, channels: [{ name: "V", unit: "V", valueAt: (t) => 325 * Math.sin(2 * Math.PI * 50 * t) }] }),
      400,
      /too short to hold one cycle: the capture lasts 10 ms/,
    ],
    ["a type Sinewright does not take", "setup.exe", new Uint8Array([0x4d, 0x5a, 0x90, 0, 3, 0, 0, 0, 4, 0, 0, 0, 0xff, 0xff, 0, 0, 0xb8]), 415, /neither PDF, a picture nor text/],
  ];

  it.each(cases)("%s", async (_name, fileName, body, status, message) => {
    const { visitor, sheet, teamId } = await teamWithSheet(`bad-${fileName.replace(/\W/g, "")}`);
    const response = await upload(visitor, sheet, fileName, body);
    expect(response.status).toBe(status);
    const answer = (await response.json()) as { error: string };
    expect(answer.error).toMatch(message);
    expect(answer.error).not.toMatch(/at .*\.(ts|js):\d+/); // no stack trace
    await expectNothingStored(teamId);
  });

  it("over the size limit: reading stops at 50 MB and the answer names the limit", async () => {
    const { visitor, sheet, teamId } = await teamWithSheet("huge");
    // Streamed without a length, so the server must count: 51 MB of valid capture rows.
    const answer = await new Promise<{ status: number; body: string }>((resolve, reject) => {
      const request = httpRequest(
        new URL(`/api/v1/sheets/${sheet}/attachments?name=huge.csv`, BASE_URL),
        { method: "POST", headers: { cookie: visitor.cookieHeader(), origin: new URL(BASE_URL).origin, "content-type": "text/csv", "transfer-encoding": "chunked" } },
        (response) => {
          let body = "";
          response.on("data", (chunk: Buffer) => (body += chunk.toString("utf8")));
          response.on("end", () => resolve({ status: response.statusCode ?? 0, body }));
        },
      );
      request.on("error", reject);
      // A sine sampled at 100 kS/s: every row valid, so only the size can stop it.
      let sample = 0;
      const rows = (count: number) => {
        let text = "";
        for (let i = 0; i < count; i++, sample++) text += `${(sample * 1e-5).toExponential(9)},${(325 * Math.sin(sample * 0.0031416)).toExponential(6)}\n`;
        return text;
      };
      let sent = 0;
      const pump = () => {
        while (sent < 51_000_000) {
          const chunk = sent === 0 ? `Time (s),V (V)\n${rows(20_000)}` : rows(20_000);
          sent += chunk.length;
          if (!request.write(chunk)) return void request.once("drain", pump);
        }
        request.end();
      };
      request.once("response", () => (sent = Number.POSITIVE_INFINITY));
      pump();
    });
    expect(answer.status).toBe(413);
    expect(JSON.parse(answer.body).error).toMatch(/over the 50 MB limit for attachments/);
    await expectNothingStored(teamId);
  });

  it("refuses a declared length over the limit before reading the body", async () => {
    const { visitor, sheet, teamId } = await teamWithSheet("declared");
    const answer = await new Promise<{ status: number; body: string }>((resolve, reject) => {
      const request = httpRequest(
        new URL(`/api/v1/sheets/${sheet}/attachments?name=big.csv`, BASE_URL),
        { method: "POST", headers: { cookie: visitor.cookieHeader(), origin: new URL(BASE_URL).origin, "content-type": "text/csv", "content-length": "60000000" } },
        (response) => {
          let body = "";
          response.on("data", (chunk: Buffer) => (body += chunk.toString("utf8")));
          response.on("end", () => resolve({ status: response.statusCode ?? 0, body }));
        },
      );
      request.on("error", reject);
      request.write("t,v\n0,1\n");
    });
    expect(answer.status).toBe(413);
    expect(JSON.parse(answer.body).error).toMatch(/over the 50 MB limit/);
    await expectNothingStored(teamId);
  });
});

describe("measured-waveform blocks in saved revisions", () => {
  it("saves the analysis and the comparison with the revision, bound by its hash, and shows them on the sheet", async () => {
    const { visitor, sheet } = await teamWithSheet("measured");
    const { attachment } = (await (await upload(visitor, sheet, "bench.csv", benchCapture)).json()) as { attachment: { id: string; sha256: string } };
    const source = `## Bench

<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" f="50 Hz" />

<MeasuredWaveform id="m1" file="bench.csv" compare="qs1" harmonics="5, 7" fundamentalTol="1 %" thdTol="1 %" harmonicTol="0.5 %" />
`;
    const saved = await visitor.postForm(`/sheets/${sheet}/edit`, { intent: "save", source, baseRevisionId: "", note: "bench" });
    expect(saved.status).toBe(302);

    const [revision] = await serverQuery<{ id: string; measurements: Record<string, { ok: boolean; attachment: { id: string; sha256: string }; comparison: { pass: boolean; rows: { key: string; pass: boolean }[] } }> }>(
      `select r.id, r.measurements from sheet_revision r join calc_sheet s on s.id = r.sheet_id where s.id = (select sheet_id from attachment where id = $1)`,
      [attachment.id],
    );
    const m1 = revision!.measurements.m1!;
    expect(m1.attachment).toEqual({ id: attachment.id, fileName: "bench.csv", sha256: attachment.sha256 });
    expect(m1.comparison.rows.map((r) => [r.key, r.pass])).toEqual([
      ["fundamental", true],
      ["thd", true],
      ["h5", true],
      ["h7", true],
    ]);
    expect(await serverQuery(`select attachment_id, sha256 from revision_attachment where revision_id = $1`, [revision!.id])).toEqual([{ attachment_id: attachment.id, sha256: attachment.sha256 }]);

    // The checker's view: the stored hash still matches, and the page shows the comparison.
    const api = (await (await visitor.get(`/api/v1/sheets/${sheet}/revisions/A`)).json()) as { integrity: { hashMatches: boolean }; measurements: Record<string, unknown> };
    expect(api.integrity.hashMatches).toBe(true);
    expect(Object.keys(api.measurements)).toEqual(["m1"]);
    const page = await pageText(await visitor.get(`/sheets/${sheet}`));
    expect(page).toContain(`aria-label="Comparison of m1 with qs1"`);
    expect(page).toContain("Matches qs1 within tolerance");
    expect(page).toContain("Probing lethal voltages.");

    // An attachment a revision measured cannot be deleted behind its back.
    await expect(serverQuery(`delete from attachment where id = $1`, [attachment.id])).rejects.toThrow(/revision_attachment/);
  });
});
