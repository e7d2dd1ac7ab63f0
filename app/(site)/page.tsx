import Link from "next/link";

const CHECKS = [
  { title: "Travel", body: "Every start and goal value inside each joint's min..max." },
  { title: "Speed and acceleration", body: "Each move's peak joint speed and acceleration against the arm's limits, with the shortest safe duration when a move is too quick." },
  { title: "Instant moves", body: "A duration-0 step larger than a joint can travel in one control cycle is flagged before the controller refuses it." },
  { title: "Recordings", body: "Guided demonstrations checked as if streamed to the controller, and repaired by rate-limiting when they jump." },
];

export default function LandingPage() {
  return (
    <div className="mx-auto max-w-6xl px-6 py-16">
      <section className="max-w-3xl">
        <p className="text-sm font-semibold uppercase tracking-widest text-copper-600">Motion plans, proven first</p>
        <h1 className="mt-3 text-5xl font-semibold tracking-tight text-ink">Jointproof</h1>
        <p className="mt-5 text-xl leading-relaxed text-ink-soft">
          Plan joint moves for small robot arms, watch them in 3D and in plots, and find every limit the controller
          would refuse — before the arm moves.
        </p>
        <div className="mt-8 flex flex-wrap gap-3">
          <Link
            href="/sign-in"
            className="rounded-md bg-brand-600 px-5 py-2.5 font-medium text-white shadow-sm hover:bg-brand-700"
          >
            Sign in
          </Link>
          <Link href="/safety" className="rounded-md border border-line bg-panel px-5 py-2.5 font-medium text-ink hover:border-brand-500">
            Read the safety notes
          </Link>
        </div>
      </section>
      <section aria-labelledby="checks" className="mt-16">
        <h2 id="checks" className="text-lg font-semibold">What a check covers</h2>
        <ul className="mt-4 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          {CHECKS.map((c) => (
            <li key={c.title} className="rounded-card border border-line bg-panel p-5">
              <h3 className="font-medium text-brand-700">{c.title}</h3>
              <p className="mt-2 text-sm leading-relaxed text-ink-soft">{c.body}</p>
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
