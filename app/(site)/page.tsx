import Link from "next/link";
import { hintFor } from "@/lib/shared/glossary";

/** Every check the engine runs, in the words of the product (PRODUCT.md's table). */
const CHECKS: { title: string; body: string; hint?: string }[] = [
  { title: "Travel", body: "Every start and goal value inside each joint's travel, min to max." },
  {
    title: "Speed",
    body: "Each move's peak joint speed against the joint's limit, with the shortest safe duration when a move is too quick.",
  },
  {
    title: "Acceleration",
    body: "Each move's peak joint acceleration against the joint's limit, for the shape you chose: cubic, quintic or trapezoid.",
  },
  {
    title: "Instant-move jump",
    body: "A duration-0 step larger than a joint can travel in one control period, which the controller would refuse.",
    hint: hintFor("controlPeriod"),
  },
  {
    title: "Effort",
    body: "Torque (or force, for a sliding joint) needed to hold and move the arm and its payload, against each motor's limit.",
  },
  {
    title: "Clearance",
    body: "Every link against the work surface and the keep-out zones, sample by sample along the motion.",
  },
  { title: "Tool speed", body: "The speed of the tool point in space, for first runs at reduced speed." },
  {
    title: "Recordings",
    body: "Hand-guided recordings checked as if streamed to the controller, with glitches and gaps found and a repair offered.",
  },
];

const primary = "rounded-md bg-brand-600 px-5 py-2.5 font-medium text-white shadow-sm hover:bg-brand-700";
const secondary = "rounded-md border border-line bg-panel px-5 py-2.5 font-medium text-ink hover:border-brand-500";

export default function LandingPage() {
  return (
    <div className="mx-auto max-w-6xl px-6 py-16">
      <section className="max-w-3xl">
        <p className="text-sm font-semibold tracking-widest text-copper-600 uppercase">
          Motion plans, checked before they run
        </p>
        <h1 className="mt-3 text-5xl font-semibold tracking-tight text-ink">Jointproof</h1>
        <p className="mt-5 text-xl leading-relaxed text-ink-soft">
          Plan joint moves for small robot arms, watch them in the 3D view and in plots, and see which limits the
          controller would refuse — before the arm moves.
        </p>
        <p className="mt-3 text-ink-soft">
          A check is a prediction from a model of the arm, not a guarantee: a plan that passes still needs the
          precautions in the safety notes.
        </p>
        <div className="mt-8 flex flex-wrap gap-3">
          <Link href="/sign-in" className={primary}>
            Sign in
          </Link>
          <Link href="/sign-up" className={secondary}>
            Create an account
          </Link>
          <Link href="/bench" className={secondary}>
            Open the try-out bench
          </Link>
          <Link href="/safety" className={secondary}>
            Read the safety notes
          </Link>
        </div>
        <p className="mt-3 text-sm text-ink-faint">The try-out bench needs no account; nothing on it is saved.</p>
      </section>
      <section aria-labelledby="checks" className="mt-16">
        <h2 id="checks" className="text-lg font-semibold">
          What a check covers
        </h2>
        <ul className="mt-4 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          {CHECKS.map((c) => (
            <li key={c.title} className="rounded-card border border-line bg-panel p-5">
              <h3 className="font-medium text-brand-700">{c.title}</h3>
              <p className="mt-2 text-sm leading-relaxed text-ink-soft">{c.body}</p>
              {c.hint ? <p className="mt-2 text-xs leading-relaxed text-ink-faint">{c.hint}</p> : null}
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
