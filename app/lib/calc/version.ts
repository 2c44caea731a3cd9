/**
 * The engine's version, stored beside every evaluated revision so a later run can
 * tell drift from a changed engine. Bump it whenever any result can change:
 * major for changed meaning of an input or output, minor for new calculators or
 * outputs, patch for corrected numbers or wording of warnings.
 */
export const ENGINE_VERSION = "2.0.0";
