import { healthResponse } from "~/lib/platform/health.server";

// server.mjs answers GET and HEAD /api/health itself with the same answer (healthWithHeaders);
// this route serves every other way in (a trailing slash, other letter case, the dev server).
export async function loader() {
  return healthResponse();
}
