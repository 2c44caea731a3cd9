import { Readable } from "node:stream";
import type { Route } from "./+types/sheets.$number.attachments.$attachmentId";
import { parseSheetNumber } from "~/lib/sheets/numbering";
import { requireMember } from "~/.server/access";
import { contentDisposition, openAttachment } from "~/.server/attachments";
import { getSheet } from "~/.server/sheets";

/**
 * GET /sheets/:number/attachments/:attachmentId — the file's bytes, streamed from the
 * store as a download. Members of the sheet's team only: anyone else gets 404, as if the
 * file did not exist.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const number = parseSheetNumber(params.number);
  const sheet = number ? await getSheet(me.team.teamId, number) : undefined;
  const opened = sheet ? await openAttachment(me.team.teamId, sheet.id, params.attachmentId) : undefined;
  if (!opened) throw new Response("Not found", { status: 404 });
  return new Response(Readable.toWeb(opened.body) as ReadableStream<Uint8Array>, {
    headers: {
      "Content-Type": opened.row.contentType,
      "Content-Length": String(opened.size || opened.row.size),
      "Content-Disposition": contentDisposition(opened.row.fileName),
      "Cache-Control": "private, no-store",
      "Content-Security-Policy": "default-src 'none'; sandbox",
    },
  });
}
