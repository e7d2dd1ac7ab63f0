import type { Metadata } from "next";
import { SAFETY_POINTS, SAFETY_SHORT } from "@/lib/shared/safety";

export const metadata: Metadata = { title: "Safety" };

export default function SafetyPage() {
  return (
    <div className="mx-auto max-w-3xl px-6 py-14">
      <h1 className="text-3xl font-semibold tracking-tight">Safety before you run a plan</h1>
      <p className="mt-4 text-lg text-ink-soft">{SAFETY_SHORT}</p>
      <p className="mt-3 text-ink-soft">
        Jointproof predicts the faults an arm&apos;s controller would raise and the collisions its model shows. It
        cannot see the real arm, the real table or the people near it. Before any plan runs on hardware:
      </p>
      <ol className="mt-6 list-decimal space-y-3 pl-6">
        {SAFETY_POINTS.map((p) => (
          <li key={p} className="leading-relaxed">
            {p}
          </li>
        ))}
      </ol>
    </div>
  );
}
