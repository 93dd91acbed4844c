import type { Route } from "./+types/calendar-feed";
import { calendarFeedFor } from "~/lib/builds/builds.server";

/**
 * A crew member's private build calendar (subscribed to from a phone's calendar app). The secret in
 * the path is the only credential, as calendar apps cannot sign in; a new link or "stop sharing"
 * ends the old one at once. Unknown, revoked and inactive people's links all answer the same 404.
 */
export async function loader({ params }: Route.LoaderArgs) {
  const feed = await calendarFeedFor(params.token ?? "");
  if (!feed)
    return new Response("Not found", {
      status: 404,
      headers: { "Content-Type": "text/plain; charset=utf-8", "Cache-Control": "no-store" },
    });
  return new Response(feed, {
    headers: {
      "Content-Type": "text/calendar; charset=utf-8",
      "Cache-Control": "private, no-store",
      "X-Robots-Tag": "noindex",
    },
  });
}
