/**
 * A sheet's attachments: the list with download links and, for writers, an upload
 * with two progress bars — bytes sent (XMLHttpRequest upload events; fetch reports
 * none) and the server's reading of a capture, streamed back as JSON lines. The
 * server keeps nothing of an upload that fails; the message says what to fix.
 */
import { useId, useRef, useState } from "react";
import { useRevalidator } from "react-router";
import { formatBytes, type AttachmentSummary } from "~/lib/attachments/files";
import { formatQuantity } from "~/lib/calc/format";
import { OverMark, PassMark } from "./calc/status-icons";

/** An attachment with the address it is downloaded from. */
export type AttachmentItem = AttachmentSummary & { url: string };

interface UploadState {
  phase: "sending" | "receiving" | "analysing" | "storing" | "done" | "failed";
  sentFraction: number;
  rows: number;
  message?: string;
}

const KIND_WORDS: Record<AttachmentItem["kind"], string> = { pdf: "PDF", image: "Picture", capture: "Capture (CSV)" };

export function AttachmentsPanel({
  sheetLabel,
  attachments,
  canUpload,
  maxBytes,
  onUploaded,
}: {
  sheetLabel: string;
  attachments: AttachmentItem[];
  canUpload: boolean;
  maxBytes: number;
  /** Called with the stored attachment, e.g. to offer a measured block for it. */
  onUploaded?: (attachment: AttachmentItem) => void;
}) {
  const uid = useId();
  const input = useRef<HTMLInputElement>(null);
  const [state, setState] = useState<UploadState | null>(null);
  const revalidator = useRevalidator();
  const busy = state !== null && state.phase !== "done" && state.phase !== "failed";

  const upload = (file: File) => {
    if (file.size > maxBytes) {
      setState({ phase: "failed", sentFraction: 0, rows: 0, message: `${file.name} is ${formatBytes(file.size)}, over the ${formatBytes(maxBytes)} limit for attachments. Attach a shorter capture or a smaller file.` });
      return;
    }
    setState({ phase: "sending", sentFraction: 0, rows: 0 });
    const request = new XMLHttpRequest();
    request.open("POST", `/api/v1/sheets/${encodeURIComponent(sheetLabel)}/attachments?name=${encodeURIComponent(file.name)}`);
    request.setRequestHeader("Accept", "application/x-ndjson");
    request.setRequestHeader("Content-Type", "application/octet-stream");
    let readUpTo = 0;
    const readLines = () => {
      const text = request.responseText;
      const end = text.lastIndexOf("\n");
      if (end < readUpTo) return;
      for (const line of text.slice(readUpTo, end).split("\n")) {
        if (!line.trim()) continue;
        const message = JSON.parse(line) as { phase?: UploadState["phase"]; rows?: number; attachment?: AttachmentItem; error?: string };
        if (message.attachment) {
          setState({ phase: "done", sentFraction: 1, rows: 0, message: `${message.attachment.fileName} is attached.` });
          onUploaded?.(message.attachment);
          void revalidator.revalidate();
        } else if (message.error) {
          setState({ phase: "failed", sentFraction: 1, rows: 0, message: message.error });
        } else if (message.phase) {
          setState((previous) => ({ phase: message.phase!, sentFraction: previous?.sentFraction ?? 0, rows: message.rows ?? 0 }));
        }
      }
      readUpTo = end + 1;
    };
    request.upload.onprogress = (event) => {
      if (event.lengthComputable) setState((previous) => ({ ...(previous ?? { phase: "sending", rows: 0 }), sentFraction: event.loaded / event.total }));
    };
    request.onprogress = readLines;
    request.onload = () => {
      if (request.getResponseHeader("content-type")?.includes("ndjson")) readLines();
      else {
        let message = `The upload failed (HTTP ${request.status}).`;
        try {
          message = (JSON.parse(request.responseText) as { error?: string }).error ?? message;
        } catch {
          // Not JSON: keep the status line.
        }
        setState({ phase: "failed", sentFraction: 1, rows: 0, message });
      }
      if (input.current) input.current.value = "";
    };
    request.onerror = () => setState({ phase: "failed", sentFraction: 0, rows: 0, message: "The connection broke during the upload; nothing was stored. Try again." });
    request.send(file);
  };

  return (
    <section aria-labelledby={`${uid}heading`} className="panel p-5 print:hidden" data-attachments="true">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={`${uid}heading`} className="font-semibold">
          Attachments
        </h2>
        <span className="text-xs text-ink-faint">PDF, pictures and CSV scope captures up to {formatBytes(maxBytes)}</span>
      </div>
      {attachments.length === 0 ? (
        <p className="mt-2 mb-0 text-sm text-ink-soft">No files attached yet.</p>
      ) : (
        <ul className="mt-3 divide-y divide-rule p-0">
          {attachments.map((a) => (
            <li key={a.id} className="flex list-none flex-col gap-1 py-2 sm:flex-row sm:items-baseline sm:gap-4">
              <a href={a.url} download className="font-mono text-sm break-all">
                {a.fileName}
              </a>
              <span className="text-xs text-ink-faint">
                {KIND_WORDS[a.kind]} · {formatBytes(a.size)} · {a.uploaderName ?? "former member"}, {a.createdAt.slice(0, 16).replace("T", " ")} UTC
              </span>
              {a.channels.length > 0 ? (
                <span className="text-xs text-ink-soft">
                  {a.channels
                    .map((c) => `${c.name}: ${formatQuantity(c.fundamentalRms, c.unit || "V")} at ${formatQuantity(c.fundamentalFrequency, "Hz")}, THD ${c.thd.toFixed(1)} %`)
                    .join("; ")}
                </span>
              ) : null}
            </li>
          ))}
        </ul>
      )}
      {canUpload ? (
        <div className="mt-4 border-t border-rule pt-4">
          <label htmlFor={`${uid}file`} className="field-label">
            Attach a file
          </label>
          <input
            ref={input}
            id={`${uid}file`}
            type="file"
            accept=".csv,.txt,.tsv,.pdf,.png,.jpg,.jpeg,.gif,.webp,text/csv,application/pdf,image/*"
            className="field-input"
            disabled={busy}
            aria-describedby={`${uid}hint`}
            onChange={(event) => {
              const file = event.target.files?.[0];
              if (file) upload(file);
            }}
          />
          <p id={`${uid}hint`} className="mt-1 mb-0 text-xs text-ink-faint">
            A capture is a CSV of time and one or more channels, as scopes export it. Sinewright checks it and works out its RMS,
            fundamental and harmonics as it arrives.
          </p>
          {state ? <UploadProgress state={state} /> : null}
        </div>
      ) : null}
    </section>
  );
}

function UploadProgress({ state }: { state: UploadState }) {
  const uid = useId();
  if (state.phase === "failed") {
    return (
      <p role="alert" className="mt-3 mb-0 flex items-start gap-1.5 rounded-md border border-[#e2b4b0] bg-danger-wash px-3 py-2 text-sm text-danger">
        <OverMark className="mt-0.5" />
        <span>{state.message} Nothing was stored.</span>
      </p>
    );
  }
  if (state.phase === "done") {
    return (
      <p role="status" className="mt-3 mb-0 flex items-center gap-1.5 text-sm text-verified">
        <PassMark /> {state.message}
      </p>
    );
  }
  const analysing = state.phase === "analysing" || state.phase === "storing";
  return (
    <div className="mt-3 space-y-2 text-sm" role="status" aria-live="polite">
      <div>
        <label htmlFor={`${uid}sent`} className="text-ink-soft">
          Sending: {Math.round(state.sentFraction * 100)} %
        </label>
        <progress id={`${uid}sent`} className="block w-full accent-[var(--color-copper)]" max={1} value={state.sentFraction} />
      </div>
      <div>
        <label htmlFor={`${uid}read`} className="text-ink-soft">
          {state.phase === "storing" ? "Storing…" : analysing ? "Analysing the capture…" : `Reading: ${state.rows.toLocaleString("en")} rows`}
        </label>
        <progress id={`${uid}read`} className="block w-full accent-[var(--color-copper)]" {...(analysing ? {} : { max: 1, value: state.sentFraction })} />
      </div>
    </div>
  );
}
