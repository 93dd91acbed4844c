import type { Route } from "./+types/not-found";
import { ProblemPage } from "~/components/problem-page";

export const meta: Route.MetaFunction = () => [{ title: "Not found · Emberwright" }];

export function loader() {
  throw new Response("Not found", { status: 404 });
}

export default function NotFoundRoute() {
  return <ProblemPage status={404} title="We could not find that page" />;
}
