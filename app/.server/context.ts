import type { Logger } from "pino";
import { createContext, RouterContextProvider } from "react-router";
import type { Database } from "./db/client";

/**
 * What the server hands every request through React Router's router context (server/app.ts
 * fills these in `getLoadContext`): the database, the request's logger (its lines carry the
 * request id) and the client address the server trusts (the socket, or a proxy named in
 * TRUST_PROXY). Route middleware adds the signed-in member (`app/.server/access.ts`).
 */
export const databaseContext = createContext<Database>();
export const loggerContext = createContext<Logger>();
export const clientAddressContext = createContext<string>();

export function requestContext(values: { database: Database; logger: Logger; clientAddress: string }): RouterContextProvider {
  const context = new RouterContextProvider();
  context.set(databaseContext, values.database);
  context.set(loggerContext, values.logger);
  context.set(clientAddressContext, values.clientAddress);
  return context;
}
