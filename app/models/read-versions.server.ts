import { db } from "~/lib/db.server";
import { dataVersionsReadWithSession } from "~/lib/session.server";
import { currentDataVersions, parseDataVersions, type DataVersions } from "./data-version.server";

/**
 * The data versions a read keeps its answers under: those read with the request's session (no
 * query of their own), else the current ones. Only for requests that read: a request that writes
 * would find the stamps from before its own writes.
 */
export async function dataVersionsForRead(request: Request): Promise<DataVersions> {
  const readWithSession = dataVersionsReadWithSession(request);
  return readWithSession === undefined ? currentDataVersions(db) : parseDataVersions(readWithSession);
}
