import { pingDatabase } from "~/lib/platform/db.server";

/** What the health check asks: the database answers a trivial query. */
export { pingDatabase };
