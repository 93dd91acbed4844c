/*
 * Secrets in request paths never reach the access log (OWASP Logging Cheat Sheet: do not log
 * "access tokens", "session identifiers"; a proposal or calendar link is a bearer credential).
 */
import { expect, test } from "vitest";
import { accessLogPath } from "~/lib/platform/access-log";

test("links that are their own credential are logged without their secret, and no query string is logged", () => {
  expect(accessLogPath("/p/Zx81kQ_abc-DEF")).toBe("/p/…");
  expect(accessLogPath("/p/Zx81kQ_abc-DEF.pdf?copy=accepted")).toBe("/p/….pdf");
  expect(accessLogPath("/p/Zx81kQ_abc-DEF/opened")).toBe("/p/…/opened");
  expect(accessLogPath("/calendar/JelK774YUi3CvgeYfW_ozv4NhGkt91pj.ics")).toBe("/calendar/….ics");
  expect(accessLogPath("/welcome/s3cr3t")).toBe("/welcome/…");
  expect(accessLogPath("/app/inbox?q=Tobias%20Wren&status=new")).toBe("/app/inbox");
  // Paths that only start alike are left alone.
  expect(accessLogPath("/photos/12")).toBe("/photos/12");
  expect(accessLogPath("/app/calendar")).toBe("/app/calendar");
});
