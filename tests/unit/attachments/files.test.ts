// Content sniffing by the published file signatures, and safe file names.
import { describe, expect, it } from "vitest";
import { safeFileName, sniffType } from "~/lib/attachments/files";

const bytes = (...values: (number | string)[]) =>
  Uint8Array.from(values.flatMap((v) => (typeof v === "string" ? [...v].map((c) => c.charCodeAt(0)) : [v])));

describe("sniffing the type from the first bytes", () => {
  it.each([
    ["PDF: '%PDF-' header (ISO 32000-1:2008, §7.5.2 File header)", bytes("%PDF-1.7\n%âãÏÓ\n"), "application/pdf"],
    ["PNG: 89 50 4E 47 0D 0A 1A 0A (W3C PNG Specification, 2nd ed., §5.2 PNG signature)", bytes(0x89, "PNG", 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, "IHDR"), "image/png"],
    ["JPEG: SOI marker FF D8 followed by a marker FF (ITU-T T.81, Annex B.1.1.3)", bytes(0xff, 0xd8, 0xff, 0xe0, 0, 16, "JFIF", 0, 1, 1, 0, 0, 1), "image/jpeg"],
    ["GIF: 'GIF89a' signature and version (GIF89a Specification, 1990, §17)", bytes("GIF89a", 1, 0, 1, 0, 0x80, 0, 0, 0, 0, 0), "image/gif"],
    ["WebP: RIFF container with form type 'WEBP' (RFC 9649, §2)", bytes("RIFF", 0x24, 0, 0, 0, "WEBPVP8 "), "image/webp"],
    ["CSV text", bytes("Time (s),CH1 (V)\n0,1\n"), "text/csv"],
  ])("%s", (_name, head, contentType) => {
    expect(sniffType(head)?.contentType).toBe(contentType);
  });

  it("refuses binary content whatever its name says (a ZIP, an executable)", () => {
    expect(sniffType(bytes("PK", 3, 4, 20, 0, 0, 0, 8, 0, 0, 0, 0, 0, 0, 0))).toBeUndefined();
    expect(sniffType(bytes(0x7f, "ELF", 2, 1, 1, 0, 0, 0, 0, 0, 0, 0, 0, 0))).toBeUndefined();
  });
});

describe("safe file names", () => {
  const csv = sniffType(bytes("t,v\n0,1\n"))!;
  const png = sniffType(bytes(0x89, "PNG", 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, "IHDR"))!;

  it("keeps the last path part only and drops control and reserved characters", () => {
    expect(safeFileName("C:\\Users\\bench\\..\\capture 01.csv", csv)).toBe("capture 01.csv");
    expect(safeFileName("../../etc/passwd", csv)).toBe("passwd.csv");
    expect(safeFileName("run\u0000\u001b[31m<1>.csv", csv)).toBe("run[31m_1_.csv");
    expect(safeFileName("...", csv)).toBe("capture.csv");
  });

  it("makes the extension match the content", () => {
    expect(safeFileName("datasheet.pdf", png)).toBe("datasheet.pdf.png");
    expect(safeFileName("scope.TXT", csv)).toBe("scope.txt");
    expect(safeFileName("photo", png)).toBe("photo.png");
  });

  it("keeps names to 120 characters", () => {
    expect(safeFileName(`${"x".repeat(300)}.csv`, csv)).toHaveLength(120);
  });
});
