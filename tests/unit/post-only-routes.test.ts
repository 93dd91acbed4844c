/*
 * Routes that only take posts answer a GET with 405 Method Not Allowed and `Allow: POST`
 * (RFC 9110 §15.5.6: a 405 response must carry Allow), not the framework's 400 for a route without
 * a loader. The list is read from app/routes.ts, so a new post-only route is checked the day it is
 * added.
 */
import { expect, test } from "vitest";
import routes from "~/routes";

type Entry = { file: string; children?: Entry[] };
const files = (entries: Entry[]): string[] => entries.flatMap((e) => [e.file, ...files(e.children ?? [])]);

const modules = await Promise.all(
  files(routes as Entry[]).map(async (file) => ({
    file,
    mod: (await import(`../../app/${file.replace(/\.tsx?$/, "")}`)) as Record<string, unknown>,
  })),
);
/** Post-only routes whose GET means something else on purpose: a typed /logout goes to the sign-in page. */
const GET_REDIRECTS = ["routes/logout.tsx"];
const postOnly = modules.filter(({ file, mod }) => mod.action && !mod.default && !GET_REDIRECTS.includes(file));

test("the route list is read: post-only routes are found among them", async () => {
  const logout = modules.find((r) => r.file === "routes/logout.tsx")!;
  const answer = (await (logout.mod.loader as () => Promise<Response>)()) as Response;
  expect([answer.status, answer.headers.get("Location")]).toEqual([302, "/login"]);
  // The tick, photo and seen endpoints are known post-only routes; finding them shows the filter works.
  const names = postOnly.map((r) => r.file);
  expect(names).toEqual(
    expect.arrayContaining(["routes/app-job-ticks.ts", "routes/app-job-photos.ts", "routes/app-inbox-seen.ts"]),
  );
});

test.each(postOnly.map((r) => [r.file, r.mod] as const))("%s answers GET with 405 and Allow: POST", async (_, mod) => {
  expect(typeof mod.loader, "a post-only route needs a loader that refuses GET").toBe("function");
  const request = new Request("http://localhost/x");
  const response = (await (mod.loader as (args: unknown) => Response | Promise<Response>)({
    request,
    params: {},
    context: {},
  })) as Response;
  expect(response.status).toBe(405);
  expect(response.headers.get("Allow")).toBe("POST");
  const body = (await response.json()) as { errors: { message: string }[] };
  expect(body.errors[0]!.message.length).toBeGreaterThan(10);
});
