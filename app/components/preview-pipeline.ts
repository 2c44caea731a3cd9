/**
 * Everything the editors' live preview runs, loaded by dynamic import once the editor is
 * on screen (`usePreview` in source-editor.tsx): the MDX check and render tree
 * (@mdx-js/mdx, remark, rehype, KaTeX), the engine (the calculators, units on mathjs) and
 * the components that show the result. No page that only reads loads any of it.
 */
export { blockSnippet, checkSheetSource, nextBlockId, setBlockInput } from "~/lib/mdx";
export { measurementSnippet } from "~/lib/mdx/components";
export { prepareSheet } from "~/lib/sheets/pipeline";
export { SheetView } from "./sheet-view";
