/**
 * Cautions shared by calculators whose results guide hardware. Kept in one place
 * so the wording is the same on every sheet.
 */
export const LETHAL_VOLTAGE_CAUTION =
  "Inverters carry lethal voltages, and DC-link capacitors stay charged after power is removed. These results are design estimates: follow local electrical codes, the applicable standards and licensed engineering practice before building, testing or energising hardware.";

export const DESIGN_ESTIMATE_CAUTION =
  "Idealised model: parasitic inductance, device tolerances, temperature drift and component ageing are not included. Verify by measurement on the built hardware.";
