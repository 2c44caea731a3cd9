import { request as httpRequest } from "node:http";
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freePort, spawnServer, testSecret, type SpawnedServer } from "../support/app-server";
import { BASE_URL, Visitor } from "../support/http";

/**
 * A POST whose body is sent in 64 KB pieces, a few milliseconds apart, until the server answers (or
 * `total` bytes went out): how many bytes had gone out by then shows whether the server waited for the body.
 */
function postUntilAnswered(url: string, headers: Record<string, string>, total: number) {
  return new Promise<{ status: number; body: string; sentBeforeAnswer: number }>((resolve, reject) => {
    let sent = 0;
    let answered = false;
    const request = httpRequest(url, { method: "POST", headers }, (response) => {
      answered = true;
      const sentBeforeAnswer = sent;
      let body = "";
      response.on("data", (chunk: Buffer) => (body += chunk.toString("utf8")));
      response.on("end", () => resolve({ status: response.statusCode ?? 0, body, sentBeforeAnswer }));
    });
    // The server closes the connection after refusing: writes after that fail, as they should.
    request.on("error", (error) => (answered ? undefined : reject(error)));
    const piece = Buffer.alloc(64 * 1024, "a");
    const pump = () => {
      if (answered) return;
      if (sent >= total) return void request.end();
      sent += piece.length;
      request.write(piece, () => setTimeout(pump, 5));
    };
    pump();
  });
}

/** The resident memory of a process, from /proc (Linux). */
function residentBytes(pid: number): number {
  const match = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
  return Number(match![1]) * 1024;
}

describe("request bodies are capped by route before they are read", () => {
  let server: SpawnedServer;
  beforeAll(async () => {
    server = await spawnServer({ DATABASE_URL: process.env.DATABASE_URL, BETTER_AUTH_SECRET: testSecret(), SMTP_URL: `smtp://127.0.0.1:${await freePort()}`, RATE_LIMITS: "off", LOG_LEVEL: "warn" });
  });
  afterAll(() => server?.stop());

  it("answers a 100 MB post to sign-in with 413 at once, declared or streamed, and the server's memory stays flat", async () => {
    const before = residentBytes(server.child.pid!);
    const form = { "content-type": "application/x-www-form-urlencoded", origin: server.url };
    const declared = await postUntilAnswered(`${server.url}/sign-in`, { ...form, "content-length": String(100 * 1024 * 1024) }, 100 * 1024 * 1024);
    expect(declared.status).toBe(413);
    expect(declared.body).toMatch(/larger than the 16 KB this address accepts/);
    expect(declared.sentBeforeAnswer).toBeLessThan(8 * 1024 * 1024);

    const streamed = await postUntilAnswered(`${server.url}/sign-in`, { ...form, "transfer-encoding": "chunked" }, 100 * 1024 * 1024);
    expect(streamed.status).toBe(413);
    expect(streamed.sentBeforeAnswer).toBeLessThan(8 * 1024 * 1024);

    const api = await postUntilAnswered(`${server.url}/api/auth/sign-in/email`, { "content-type": "application/json", origin: server.url, "transfer-encoding": "chunked" }, 100 * 1024 * 1024);
    expect(api.status).toBe(413);
    expect(JSON.parse(api.body).error).toMatch(/larger than/);
    expect(residentBytes(server.child.pid!) - before).toBeLessThan(40 * 1024 * 1024);
    // The server still answers.
    expect((await fetch(`${server.url}/healthz`)).status).toBe(200);
  });

  it("lets ordinary forms through and keeps the attachment limit for the attachment upload alone", async () => {
    const visitor = new Visitor(server.url);
    // A normal sign-in attempt is read and answered (wrong password: the form says so).
    const wrong = await visitor.postForm("/sign-in", { email: "nobody@example.org", password: "not-the-password", next: "" });
    expect(wrong.status).toBe(400);
    // A sheet page's form takes at most 256 KB; a declared 1 MB is refused unread.
    const big = await postUntilAnswered(`${server.url}/sheets/CS-0001`, { "content-type": "application/x-www-form-urlencoded", origin: server.url, "content-length": String(1024 * 1024) }, 1024 * 1024);
    expect(big.status).toBe(413);
    // The attachment upload accepts a declared length past the form limits (its own limit answers further on).
    const upload = await postUntilAnswered(`${server.url}/api/v1/sheets/CS-0001/attachments?name=a.csv`, { "content-type": "text/csv", "content-length": String(5 * 1024 * 1024) }, 5 * 1024 * 1024);
    expect(upload.status).toBe(401);
  });
});

describe("caching of signed-in answers", () => {
  it("marks every signed-in page and data answer private and not to be stored", async () => {
    const viewer = await new Visitor(BASE_URL).signIn("viewer@example.com");
    for (const path of ["/sheets/CS-0001", "/sheets/CS-0001.data", "/sheets", "/documents/PD-0001", "/documents/PD-0001.data", "/desk", "/search?q=ripple"]) {
      const response = await viewer.get(path);
      expect(response.status, path).toBe(200);
      expect(response.headers.get("cache-control"), path).toBe("private, no-store");
      await response.arrayBuffer();
    }
  });
});
