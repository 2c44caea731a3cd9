import { describe, expect, it } from "vitest";
import { getCalculator } from "~/lib/calc/registry";
import { prepareSheet } from "~/lib/sheets/pipeline";
import { readQuantity } from "~/lib/calc/units";
import { blockValuesText, HIT_START, HIT_STOP, markedToSegments, proseText, matchedBlockLine, quantitySpellings, scopedValueWord, scopeValueWords, shownBlockValues, SPELLINGS_MARK } from "~/lib/search/document-text";

describe("quantity spellings", () => {
  it("spells 20 kHz the ways engineers type it", () => {
    expect(quantitySpellings(20_000, "Hz")).toEqual(expect.arrayContaining(["20 khz", "20khz", "20000 hz", "20.0 khz"]));
  });

  it("writes micro with a plain u as well as µ", () => {
    expect(quantitySpellings(4.7e-6, "F")).toEqual(expect.arrayContaining(["4.7 µf", "4.7 uf", "4.7uf"]));
  });

  it("keeps unprefixed units unprefixed", () => {
    const spellings = quantitySpellings(30, "deg");
    expect(spellings).toContain("30°");
    expect(spellings.some((s) => s.includes("k"))).toBe(false);
  });
});

describe("values named by their input or calculator", () => {
  const scopes = new Set(["vdc", "fsw", "c", "lc-filter", "quasi-square"]);
  const rewrite = (query: string) => scopeValueWords(query, (word) => scopes.has(word.toLowerCase()), readQuantity);

  it("writes a named value as one word, the same however the value is typed", () => {
    expect(scopedValueWord("vdc", 400, "V")).toBe("vdc400v");
    expect(scopedValueWord("lc-filter", 1e-5, "F")).toBe("lcfilter10uf");
    expect(rewrite("vdc 400 V")).toBe("vdc400v");
    expect(rewrite("fsw 20 kHz")).toBe(rewrite("fsw 20000 Hz"));
    expect(rewrite("c 4.7 µF")).toBe("c4.7uf");
    expect(rewrite("c 4700 nF")).toBe("c4.7uf");
  });

  it("leaves alone words that name nothing, values without a unit and quoted queries", () => {
    expect(rewrite("filter 10 uF")).toBe("filter 10 uF");
    expect(rewrite("vdc 400")).toBe("vdc 400");
    expect(rewrite('"vdc 400 V"')).toBe('"vdc 400 V"');
    expect(rewrite("pump inverter vdc 400V output")).toBe("pump inverter vdc400v output");
  });

  it("puts each input's and result's named words in the block's search text", () => {
    const text = blockValuesText(
      [{ blockId: "qs1", calculator: "quasi-square", inputs: { vdc: "48 V", alpha: "30 deg" }, parsedInputs: { vdc: 48, alpha: 30 }, results: { v1Rms: { value: 41.7, unit: "V", display: "41.7 V" } } }],
      getCalculator,
    );
    expect(text).toContain("vdc48v");
    expect(text).toContain("quasisquare48v");
    expect(text).toContain("v1rms41.7v");
  });
});

describe("search text of a sheet", () => {
  const prepared = prepareSheet(
    `## Output filter\n\nThe corner sits well below the switching frequency.\n\n<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" />\n\n<LcFilter id="lc1" l="1 mH" c="10 uF" rLoad="10 ohm" fsw="20kHz" vout="=qs1.v1Rms" />\n`,
    "sheet",
  );
  if (!prepared.ok) throw new Error(JSON.stringify(prepared.problems));

  it("takes the prose without the blocks", () => {
    const text = proseText(prepared.tree);
    expect(text).toContain("Output filter");
    expect(text).toContain("The corner sits well below the switching frequency.");
  });

  it("lists calculator ids, inputs as typed and normalised, and result displays", () => {
    const blocks = prepared.blocks.map((b) => {
      const outcome = prepared.evaluation.blocks[b.id];
      return { blockId: b.id, calculator: b.calculator, inputs: b.inputs, parsedInputs: outcome?.ok ? outcome.inputs : null, results: outcome?.ok ? outcome.results : null };
    });
    const [quasiSquare, lcFilter] = blockValuesText(blocks, getCalculator).split("\n");
    expect(quasiSquare).toMatch(/^qs1 · .* \(quasi-square\): vdc 48 V, alpha 30 deg → .*\u001f.*48 v/);
    expect(lcFilter).toContain("(lc-filter)");
    expect(lcFilter).toContain("fsw 20kHz");
    expect(lcFilter).toContain("20 khz");
    expect(lcFilter).toContain("f0 1.59 kHz");
    // A referenced input contributes its computed value, not the reference.
    expect(lcFilter).not.toContain("=qs1");
    expect(lcFilter).toMatch(/vout 37\.4\d* V/); // qs1.v1Rms = 4·48/π·cos 30°/√2 = 37.43 V (derived)
  });

  it("picks the block line a query found, by its shown values or its spellings, and marks the words shown as typed", () => {
    const values = [`qs1 · Quasi-square (quasi-square): vdc 48 V, alpha 30 deg${SPELLINGS_MARK}48 v 48v`, `lc1 · LC output filter (lc-filter): fsw 20kHz${SPELLINGS_MARK}20 khz 20000 hz`].join("\n");
    expect(matchedBlockLine(values, "20000 hz")).toBe("lc1 · LC output filter (lc-filter): fsw 20kHz");
    expect(matchedBlockLine(values, "quasi-square 48 V")).toBe(`qs1 · ${HIT_START}Quasi-square${HIT_STOP} (${HIT_START}quasi-square${HIT_STOP}): vdc ${HIT_START}48${HIT_STOP} ${HIT_START}V${HIT_STOP}, alpha 30 deg`);
    expect(matchedBlockLine(values, "damping")).toBeUndefined();
  });

  it("shows a reader the block and its values as typed, never the extra spellings", () => {
    const line = `lc1 · LC output filter (lc-filter): fsw 20kHz${SPELLINGS_MARK}20 khz ${HIT_START}20khz${HIT_STOP} 20000 hz`;
    expect(shownBlockValues(`qs1 · x: vdc 48 V${SPELLINGS_MARK}48 v\n${line}`, HIT_START)).toBe("lc1 · LC output filter (lc-filter): fsw 20kHz");
    expect(shownBlockValues(`lc1 · x: fsw ${HIT_START}20kHz${HIT_STOP}${SPELLINGS_MARK}20 khz`, HIT_START)).toBe(`lc1 · x: fsw ${HIT_START}20kHz${HIT_STOP}`);
  });
});

describe("snippet segments", () => {
  it("turns engine marks into plain segments, never markup", () => {
    const marked = `a <b>bold</b> ${HIT_START}filter${HIT_STOP} and ${HIT_START}inverter${HIT_STOP}`;
    expect(markedToSegments(marked, HIT_START, HIT_STOP)).toEqual([
      { text: "a <b>bold</b> ", hit: false },
      { text: "filter", hit: true },
      { text: " and ", hit: false },
      { text: "inverter", hit: true },
    ]);
  });

  it("joins neighbouring marks and keeps an unclosed mark's text", () => {
    expect(markedToSegments(`${HIT_START}20${HIT_STOP}${HIT_START} kHz`, HIT_START, HIT_STOP)).toEqual([{ text: "20 kHz", hit: true }]);
  });
});
