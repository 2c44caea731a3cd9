/**
 * The words Sinewright puts beside results that may guide hardware, and what a stamp is. One wording, used by the
 * pages, the print and the JSON API alike.
 */
export const HARDWARE_CAUTION =
  "Inverter DC links and outputs can kill, and grid-tied equipment must meet its interconnection rules. These " +
  "calculations support, and never replace, the applicable standards, local electrical codes and review by a licensed " +
  "or otherwise qualified engineer.";

/** A stamp is the team's own record of a second engineer's check, and must never read as more. */
export const STAMP_MEANING =
  "A stamp records an internal peer check by a second engineer of the team: it is not a professional engineer's seal, " +
  "a certification or a compliance approval.";
