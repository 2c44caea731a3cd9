import type { Route } from "./+types/api.v1.sheets.$number.attachments";
import { parseSheetNumber } from "~/lib/sheets/numbering";
import { requireMember } from "~/.server/access";
import { apiError, methodNotAllowed, resultsJson, withCaution } from "~/.server/api";
import { AttachmentError, listAttachments, uploadAttachment, type IngestProgress } from "~/.server/attachments";
import type { AttachmentSummary } from "~/lib/attachments/files";
import { loggableError, logger } from "~/.server/logger";
import { getSheet } from "~/.server/sheets";

/** GET /api/v1/sheets/:number/attachments — the sheet's attachments, with each capture's channels. Viewers and up. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const number = parseSheetNumber(params.number);
  const sheet = number ? await getSheet(me.team.teamId, number) : undefined;
  if (!sheet) return apiError(404, `No sheet ${params.number} in this team.`);
  return resultsJson({ sheet: sheet.label, attachments: (await listAttachments(sheet.id)).map((a) => withUrl(a, sheet.label)) });
}

/**
 * POST /api/v1/sheets/:number/attachments?name=<file name> — the file itself is the body
 * (any Content-Type). Engineers and up. Answers 201 `{ attachment }`, or an error naming
 * what to fix (400 unreadable capture, 413 over the limit, 415 not an accepted type).
 * With `Accept: application/x-ndjson` the answer streams one JSON line per step
 * (`{"phase":"receiving","bytes":…,"rows":…}`) and ends with `{"attachment":…}` or
 * `{"error":…,"status":…}`, for progress bars.
 */
export async function action({ request, params, context }: Route.ActionArgs) {
  const me = await requireMember(request, context, "engineer");
  if (request.method !== "POST") return methodNotAllowed("POST");
  const number = parseSheetNumber(params.number);
  const sheet = number ? await getSheet(me.team.teamId, number) : undefined;
  if (!sheet) return apiError(404, `No sheet ${params.number} in this team.`);
  const fileName = new URL(request.url).searchParams.get("name")?.trim() ?? "";
  if (!fileName) return apiError(400, "Name the file in the address: ?name=capture.csv.", [{ field: "name", message: "the file's name is required" }]);
  if (!request.body) return apiError(400, "The file is empty. Send its bytes as the request body.");
  const lengthHeader = request.headers.get("content-length");
  const declaredLength = lengthHeader && /^\d+$/.test(lengthHeader) ? Number(lengthHeader) : undefined;
  const upload = (onProgress?: (progress: IngestProgress) => void) =>
    uploadAttachment(me, sheet, { fileName, body: request.body!, declaredLength, onProgress });

  if (!(request.headers.get("accept") ?? "").includes("application/x-ndjson")) {
    try {
      const attachment = await upload();
      return resultsJson({ attachment: withUrl(attachment, sheet.label) }, { status: 201 });
    } catch (error) {
      return failure(error);
    }
  }

  const encoder = new TextEncoder();
  const stream = new ReadableStream<Uint8Array>({
    async start(controller) {
      const line = (value: unknown) => controller.enqueue(encoder.encode(`${JSON.stringify(value)}\n`));
      try {
        const attachment = await upload((progress) => line(progress));
        line(withCaution({ attachment: withUrl(attachment, sheet.label) }));
      } catch (error) {
        const answer = failure(error);
        line({ ...(await answer.json()), status: answer.status });
      }
      controller.close();
    },
  });
  return new Response(stream, { headers: { "Content-Type": "application/x-ndjson; charset=utf-8", "Cache-Control": "no-store" } });
}

function withUrl(attachment: AttachmentSummary, sheetLabel: string) {
  return { ...attachment, url: `/sheets/${sheetLabel}/attachments/${attachment.id}` };
}

function failure(error: unknown): Response {
  if (error instanceof AttachmentError) return apiError(error.status, error.message);
  logger().error({ err: loggableError(error) }, "storing an attachment failed");
  return apiError(500, "The file could not be stored, and nothing was kept. Try again; if it keeps failing, tell your administrator.");
}
