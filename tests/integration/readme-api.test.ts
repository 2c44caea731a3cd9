import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { BASE_URL } from "../support/http";
import { containsSubset } from "../support/subset";

/**
 * Runs the README's API examples against the test server, as documented: each
 * `curl` block is translated to a fetch (same method, headers, body, cookie
 * jar) and the JSON block after it must be contained in the real answer.
 */
const readme = readFileSync(new URL("../../README.md", import.meta.url), "utf8");
const apiSection = readme.slice(readme.indexOf("## API"));
const blocks = [...apiSection.matchAll(/```(sh|json)\n([\s\S]*?)```/g)].map((m) => ({ lang: m[1]!, body: m[2]! }));

interface Example {
  command: string;
  expected?: unknown;
}
const examples: Example[] = [];
for (let i = 0; i < blocks.length; i++) {
  const block = blocks[i]!;
  if (block.lang !== "sh" || !block.body.includes("curl ")) continue;
  const next = blocks[i + 1];
  examples.push({ command: block.body, expected: next?.lang === "json" ? JSON.parse(next.body) : undefined });
}

/** Splits a shell command the way sh would for the quoting the README uses (single quotes, backslash-newline). */
function shellWords(command: string): string[] {
  const words: string[] = [];
  const text = command.replace(/\\\n/g, " ");
  const pattern = /'([^']*)'|"([^"]*)"|(\S+)/g;
  for (const match of text.matchAll(pattern)) words.push(match[1] ?? match[2] ?? match[3]!);
  return words;
}

const jar = new Map<string, string>();

async function runCurl(command: string): Promise<Response> {
  const words = shellWords(command);
  expect(words[0]).toBe("curl");
  const headers = new Headers();
  let body: string | undefined;
  let url = "";
  let useJar = false;
  let saveJar = false;
  for (let i = 1; i < words.length; i++) {
    const word = words[i]!;
    if (word === "-s") continue;
    else if (word === "-H") {
      const [name, ...rest] = words[++i]!.split(":");
      headers.set(name!.trim(), rest.join(":").trim());
    } else if (word === "-d") body = words[++i];
    else if (word === "--data-binary") body = readFileSync(new URL(`../../${words[++i]!.replace(/^@/, "")}`, import.meta.url), "utf8");
    else if (word === "-b") (useJar = true), i++;
    else if (word === "-c") (saveJar = true), i++;
    else if (word.startsWith("http")) url = word;
    else throw new Error(`the README uses a curl option this test does not know: ${word}`);
  }
  if (useJar) headers.set("cookie", [...jar].map(([k, v]) => `${k}=${v}`).join("; "));
  const target = new URL(new URL(url).pathname + new URL(url).search, BASE_URL);
  // Node's fetch adds `Sec-Fetch-Mode: cors`, which curl does not send; better-auth then wants an Origin like a browser's.
  if (body !== undefined) headers.set("origin", new URL(BASE_URL).origin);
  const response = await fetch(target, { method: body === undefined ? "GET" : "POST", headers, body });
  if (saveJar) {
    for (const line of response.headers.getSetCookie()) {
      const [pair] = line.split(";");
      const at = pair!.indexOf("=");
      jar.set(pair!.slice(0, at), pair!.slice(at + 1));
    }
  }
  return response;
}

describe("the README's API examples", () => {
  it("documents at least the sign-in, catalogue, evaluate and sheet examples", () => {
    expect(examples.length).toBeGreaterThanOrEqual(5);
  });

  it("answer as documented, in order", async () => {
    for (const example of examples) {
      const response = await runCurl(example.command);
      const json = await response.json();
      if (example.expected !== undefined) {
        expect(containsSubset(json, example.expected), example.command).toBeNull();
      } else {
        expect(response.ok, `${example.command} answered ${response.status} ${JSON.stringify(json)}`).toBe(true);
      }
    }
  });
});
