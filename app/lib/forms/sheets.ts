import { z } from "zod";
import { SOURCE_LIMITS } from "../mdx/types";

export const tagList = z
  .string()
  .default("")
  .transform((text) => [...new Set(text.split(",").map((t) => t.trim().toLowerCase()).filter(Boolean))])
  .pipe(z.array(z.string().max(40, "Keep each tag under 40 characters.")).max(12, "Use at most 12 tags."));

export const sheetDetailsForm = z.object({
  title: z.string().trim().min(3, "Give the sheet a title of at least 3 characters, e.g. “Output filter for the 3 kW stage”.").max(160, "Keep the title under 160 characters."),
  projectId: z.string().default(""),
  tags: tagList,
});

export const projectForm = z.object({
  code: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9-]{1,23}$/, "Use 2–24 letters, digits or hyphens for the code, e.g. PUMP-3K."),
  name: z.string().trim().min(3, "Give the project a name of at least 3 characters.").max(120, "Keep the name under 120 characters."),
  client: z.string().trim().max(120, "Keep the client under 120 characters.").default(""),
  description: z.string().trim().max(2000, "Keep the description under 2000 characters.").default(""),
});

export const documentDetailsForm = z.object({
  title: z.string().trim().min(3, "Give the document a title of at least 3 characters, e.g. “Design report, 3 kW pump inverter”.").max(160, "Keep the title under 160 characters."),
  projectId: z.string().trim().min(1, "Choose the project this document belongs to."),
});

/** One citation a project panel or document page asks to move to its sheet's newest verified revision. */
export const citationUpdateForm = z.object({
  intent: z.literal("update-citation"),
  documentId: z.string().min(1, "Say which document holds the citation."),
  sheet: z.string().trim().min(1, "Say which sheet the citation names.").max(20),
  rev: z.string().trim().min(1, "Say which revision the citation names.").max(4),
});

/**
 * The MDX editor's form, for sheets and documents alike: save, autosave a draft, or
 * discard it. `baseField` names the revision (or version) the author started from.
 */
export function sourceEditorForm<K extends "baseRevisionId" | "baseVersionId">(baseField: K, unit: "revision" | "version") {
  const base = { [baseField]: z.string().default("") } as { [P in K]: z.ZodDefault<z.ZodString> };
  const source = z.string().max(SOURCE_LIMITS.maxLength * 2, "The source is far over the 200 KB limit.");
  return z.discriminatedUnion("intent", [
    z.object({ intent: z.literal("save"), source, ...base, note: z.string().trim().max(500, `Keep the ${unit} note under 500 characters.`).default("") }),
    z.object({ intent: z.literal("autosave"), source, ...base }),
    z.object({ intent: z.literal("discard-draft") }),
  ]);
}
