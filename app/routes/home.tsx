import { Link } from "react-router";
import type { Route } from "./+types/home";
import { PublicShell } from "~/components/public-shell";
import { RingSketch } from "~/components/ring-sketch";

export const meta: Route.MetaFunction = () => [
  { title: "Emberwright · Fire-pit requests that arrive with the cut list done" },
  {
    name: "description",
    content:
      "A configurator for your customers and a workspace for your crew: round masonry fire pits sized, priced and cut from your own stock.",
  },
];

const POINTS = [
  {
    title: "Homeowners size it themselves",
    body: "Your public page lets a customer choose the bowl, the wall stone, the courses, the cap and the liner from your own stock, see it built in 3D, and see a price range before they call.",
  },
  {
    title: "Every request carries the plan",
    body: "Units per course, closure and trim cuts, the cap count that closes the circle with even joints, and the marks to measure from each corner of every cap blank.",
  },
  {
    title: "One trip to the supply yard",
    body: "The material order comes with the lead: wall units and spares, caps, liner, base stone in tons, adhesive cartridges, pavers and sand, priced from your catalog.",
  },
];

export default function HomeRoute() {
  return (
    <PublicShell>
      <main>
        <section className="mx-auto grid max-w-6xl items-center gap-10 px-4 py-12 sm:px-6 md:grid-cols-[1.2fr_1fr] md:py-20">
          <div>
            <p className="text-sm font-extrabold tracking-widest text-ember-600 uppercase">For hardscape contractors</p>
            <h1 className="mt-3 text-4xl leading-tight font-extrabold sm:text-5xl">
              Fire-pit requests that arrive with the cut list done.
            </h1>
            <p className="mt-5 max-w-xl text-lg text-char-600">
              Emberwright turns a homeowner's idea into an exact round masonry fire pit: real unit sizes, caps that
              close the circle, a material order and a price, so your estimator answers serious leads and your crew cuts
              once.
            </p>
            <div className="mt-8 flex flex-wrap gap-3">
              <Link to="/c/cinder-slate" className="btn-primary px-5 py-3 text-base">
                Try a contractor's page
              </Link>
              <Link to="/login" className="btn-quiet px-5 py-3 text-base">
                Staff sign-in
              </Link>
            </div>
          </div>
          <RingSketch className="mx-auto w-full max-w-sm drop-shadow-sm" />
        </section>
        <section aria-label="What Emberwright does" className="border-y border-ash-200 bg-white">
          <div className="mx-auto grid max-w-6xl gap-6 px-4 py-12 sm:px-6 md:grid-cols-3">
            {POINTS.map((point) => (
              <article key={point.title}>
                <h2 className="text-lg font-extrabold">{point.title}</h2>
                <p className="mt-2 text-char-600">{point.body}</p>
              </article>
            ))}
          </div>
        </section>
        <section className="mx-auto max-w-6xl px-4 py-12 sm:px-6">
          <h2 className="text-2xl font-extrabold">Built on the trade's geometry</h2>
          <p className="mt-3 max-w-3xl text-char-600">
            Straight units around a centre make a polygon, not a circle. Emberwright measures every diameter to the
            middle of a unit's straight face, not its corners, tells you whether the face joints or the back joints
            close first, and cuts each cap as an identical wedge so the joints stay even all the way round.
          </p>
        </section>
      </main>
    </PublicShell>
  );
}
