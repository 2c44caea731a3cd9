import { describe, expect, it } from "vitest";
import { PrintTitleStrip } from "~/components/print-button";
import { TitleBlock } from "~/components/title-block";
import { VerificationStamp } from "~/components/verification-stamp";
import { render, textOf } from "./markup";

// A stamp is the team's record of a peer check; wherever one is shown or printed, it must not pass for a seal.
const NOT_A_SEAL = /internal peer check.*not a professional engineer's seal, a certification or a compliance approval/;

describe("what a stamp is, where stamps are shown", () => {
  it("the stamp says it is an internal peer check, not a seal, certification or approval", () => {
    const html = render(<VerificationStamp checkerName="Ada Checker" date="2026-11-30" contentHash={"ab".repeat(32)} engineVersion="1.0.0" valid />);
    expect(html).toContain('aria-label="Verified by Ada Checker on 2026-11-30, content hash abababababab"');
    expect(textOf(html)).toMatch(NOT_A_SEAL);
  });

  it("the title block says so too", () => {
    const data = { teamName: "Team", project: "UPS-48", number: "CS-0002", title: "DC link", revision: "B", preparer: "Ada", date: "2026-11-30", status: "verified", engineVersion: "1.0.0" };
    expect(textOf(render(<TitleBlock data={data} />))).toMatch(NOT_A_SEAL);
  });

  it("and the foot of every printed page", () => {
    const css = render(<PrintTitleStrip left="Team" center="CS-0002 rev B" right="verified" />);
    expect(css).toMatch(/@bottom-left \{ content: "Printed from Sinewright: the on-line revision is the controlled copy\. A stamp records an internal peer check/);
    expect(css).toMatch(NOT_A_SEAL);
  });
});
