import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { demoArms, demoProjects, demoRecording } from "@/db/demo";
import armH from "@/kinematics/arm/presets/bench-arm-h.json";
import armL from "@/kinematics/arm/presets/bench-arm-l.json";

// Names of our own (issue 13): the words here must not come back. No outside source; these pin
// the project's own vocabulary (DEVELOPERS.md, Glossary).
const read = (path: string) => readFileSync(path, "utf8");

describe("renamed labels stay renamed", () => {
  it("names the demo arms 'Bench arm · gripper' and 'Bench arm · guide handle', without H/L letters", () => {
    expect(armH.name).toBe("Bench arm · gripper");
    expect(armL.name).toBe("Bench arm · guide handle");
    expect(demoArms.map((a) => a.name)).toEqual(["Bench arm · guide handle", "Bench arm · gripper"]);
  });

  it("calls the demo project and recording hand-guided, never 'lead arm'", () => {
    const names = [...demoProjects.map((p) => p.name), demoRecording.name];
    expect(names).toContain("Hand-guided demonstrations");
    expect(demoRecording.name).toBe("Hand-guided reach");
    for (const n of names) expect(n).not.toMatch(/lead[- ]arm/i);
    expect(read("db/demo.ts")).not.toMatch(/lead[- ]arm/i);
  });

  it("landing page names every check and claims no proof", () => {
    const landing = read("app/(site)/page.tsx");
    for (const check of [
      "Travel",
      "Speed",
      "Acceleration",
      "Instant-move jump",
      "Effort",
      "Clearance",
      "Tool speed",
      "Recordings",
    ]) {
      expect(landing).toContain(`title: "${check}"`);
    }
    expect(landing).toContain('href="/sign-up"');
    expect(landing).toContain('href="/bench"');
    for (const file of ["app/(site)/page.tsx", "app/layout.tsx"])
      expect(read(file)).not.toMatch(/\bprove(n|s)?\b|\bproof\b/i);
  });

  it("shows API methods in plain monospace, without a colour per method", () => {
    const docs = read("app/(site)/api-docs/page.tsx");
    expect(docs).not.toContain("methodStyle");
    const method = /<span className="([^"]*)">\{o\.method\}<\/span>/.exec(docs);
    expect(method?.[1]).toContain("font-mono");
    expect(method?.[1]).not.toMatch(/bg-|text-(pass|caution|fault|brand)/);
  });

  it("uses only the app's own palette in the e-mail templates", () => {
    const palette = new Set(
      [...read("app/globals.css").matchAll(/--color-[\w-]+:\s*(#[0-9a-f]{6})/gi)].map((m) => m[1].toLowerCase()),
    );
    expect(palette.size).toBeGreaterThan(10);
    const used = [...read("lib/server/mail/templates.ts").matchAll(/#[0-9a-f]{6}\b/gi)].map((m) => m[0].toLowerCase());
    expect(used.length).toBeGreaterThan(0);
    for (const colour of used) expect(palette.has(colour), colour).toBe(true);
  });

  it("has no 'Scratch bench', 'Scratch plan' or '3D stage' on the landing, the projects pages and the try-out bench", () => {
    const files = [
      "app/(site)/page.tsx",
      "app/(site)/api-docs/page.tsx",
      "app/layout.tsx",
      "app/not-found.tsx",
      "app/error.tsx",
      "components/projects/projects-dashboard.tsx",
      "components/projects/project-overview.tsx",
      "components/editor/scratch-bench.tsx",
      "components/editor/bench.tsx",
      "app/(workspace)/bench/page.tsx",
      "DEVELOPERS.md",
    ];
    for (const file of files) {
      const text = read(file)
        .replace(/\| try-out bench, unsaved plan \| scratch bench, scratch plan \|/, "")
        .replace(/\| 3D view, viewer \| stage \|/, "");
      expect(text, file).not.toMatch(/scratch (bench|plan)|3D stage/i);
    }
  });
});
