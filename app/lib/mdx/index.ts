/** The sheet-source pipeline: check author MDX, list its blocks, build its render tree, edit inputs in place. */
export { checkSheetSource } from "./check";
export {
  allowedComponentNames,
  blockSnippet,
  CALCULATOR_COMPONENTS,
  CAUTION_COMPONENT,
  CITE_COMPONENT,
  calculatorIdOf,
  componentNameOf,
  nextBlockId,
  SAFE_HTML_ELEMENTS,
  SOURCE_BLOCK_ID_PATTERN,
  type CalculatorComponent,
} from "./components";
export { setBlockInput, setCitationRevision } from "./edit";
export * from "./types";
