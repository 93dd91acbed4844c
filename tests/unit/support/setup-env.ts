import { randomUUID } from "node:crypto";
import { tmpdir } from "node:os";
import path from "node:path";

// Each test file gets a database of its own, so files can run in parallel and in any order.
process.env.DATABASE_URL ??= `file:${path.join(tmpdir(), "emberwright-tests", `${randomUUID()}.db`)}`;
process.env.UPLOADS_DIR ??= path.join(tmpdir(), "emberwright-tests", `uploads-${randomUUID()}`);
process.env.OUTBOX_WORKER = "off";
// Route tests stand behind a local proxy (see routeArgs): its X-Forwarded-For names the client.
process.env.TRUST_PROXY ??= "loopback";
