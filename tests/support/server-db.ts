import pg from "pg";

/** One query on the database at `url`, on a connection of its own. */
export async function serverQueryOn<T extends pg.QueryResultRow>(url: string, text: string, values: unknown[] = []): Promise<T[]> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    return (await client.query<T>(text, values)).rows;
  } finally {
    await client.end();
  }
}

/** Read-only look into the running test server's database, to check what a request stored. */
export async function serverQuery<T extends pg.QueryResultRow>(text: string, values: unknown[] = []): Promise<T[]> {
  const url = process.env.TEST_SERVER_DATABASE_URL;
  if (!url) throw new Error("TEST_SERVER_DATABASE_URL is not set: run the suite through `npm test`.");
  return serverQueryOn<T>(url, text, values);
}
