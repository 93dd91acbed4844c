/**
 * The loader of a route that only takes posts: a GET (a typed address, a prefetch, a crawler)
 * answers 405 with `Allow: POST` and a JSON body saying where the post comes from, instead of the
 * framework's 400 for a route without a loader.
 */
export function postOnly(message: string): () => Response {
  return () =>
    Response.json(
      { errors: [{ path: "", message }] },
      { status: 405, headers: { Allow: "POST", "Cache-Control": "no-store" } },
    );
}
