import { STAMP_MEANING } from "~/lib/cautions";

/**
 * Sinewright's verification stamp: a squared seal with a clipped corner, the
 * checker's name, the date and the short content hash it is bound to, with
 * what a stamp is (and is not) beside it.
 */
export function VerificationStamp({ checkerName, date, contentHash, engineVersion, valid }: { checkerName: string; date: string; contentHash: string; engineVersion: string; valid: boolean }) {
  return (
    <figure className="inline-flex max-w-xs flex-col gap-1.5">
      <div
        role="img"
        aria-label={valid ? `Verified by ${checkerName} on ${date}, content hash ${contentHash.slice(0, 12)}` : `Stamp void: content no longer matches hash ${contentHash.slice(0, 12)}`}
        className={`verification-stamp inline-block select-none self-start border-[3px] border-double px-4 py-2 font-mono text-[11px] leading-tight [clip-path:polygon(0_0,calc(100%-14px)_0,100%_14px,100%_100%,0_100%)] ${
          valid ? "border-verified text-verified" : "border-danger text-danger line-through"
        }`}
      >
        <span className="block font-sans text-sm font-bold uppercase tracking-[0.2em]">{valid ? "Verified" : "Void"}</span>
        <span className="block font-sans text-xs">checked by {checkerName}</span>
        <span className="block">{date}</span>
        <span className="block">#{contentHash.slice(0, 12)} · engine {engineVersion}</span>
      </div>
      <figcaption className="text-[11px] leading-snug text-ink-faint">{STAMP_MEANING}</figcaption>
    </figure>
  );
}
