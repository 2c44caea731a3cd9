import { sql } from "drizzle-orm";
import { db } from "~/.server/db/client";

/** Liveness and database reachability, for load balancers and `npm start`'s check. */
export async function loader() {
  try {
    await db().execute(sql`select 1`);
    return Response.json({ status: "ok", database: "reachable" }, { headers: { "Cache-Control": "no-store" } });
  } catch {
    return Response.json({ status: "degraded", database: "unreachable" }, { status: 503, headers: { "Cache-Control": "no-store" } });
  }
}
