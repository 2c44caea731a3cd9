/** Printed with every harmonic-limit verdict. Its own module, so a page that shows a verdict need not load the calculator that reached it. */
export const VERDICT_NOTE = "Engineering estimate — compliance is established by accredited testing and the utility's interconnection rules.";
