/**
 * The invented demo scenario: a community college's motion lab. Every name, address and
 * number here is made up for the demo. db/seed.ts writes it; `npm start` prints the sign-ins.
 * Fixed ids keep the seed idempotent: a second run updates the same rows.
 */
import type { MemberRole, ProjectKind } from "./schema/projects";
import type { SiteRole } from "./schema/users";

export type DemoPerson = { id: string; email: string; name: string; password: string; role: SiteRole };

export const demoPeople = [
  { id: "00000000-0000-4000-8000-000000000001", email: "ines.varga@example.com", name: "Ines Varga", password: "bench-instructor-01", role: "instructor" },
  { id: "00000000-0000-4000-8000-000000000002", email: "tomas.reyes@example.com", name: "Tomas Reyes", password: "bench-student-01", role: "student" },
  { id: "00000000-0000-4000-8000-000000000003", email: "aiko.marsh@example.com", name: "Aiko Marsh", password: "bench-student-02", role: "student" },
  { id: "00000000-0000-4000-8000-000000000004", email: "jun.halloran@example.com", name: "Jun Halloran", password: "bench-research-01", role: "researcher" },
  { id: "00000000-0000-4000-8000-000000000005", email: "lab.admin@example.com", name: "Lab Admin", password: "bench-admin-0001", role: "admin" },
] as const satisfies readonly DemoPerson[];

/** The lines `npm start` prints after seeding: `  email / password (role)`. */
export function demoSignInLines(): string[] {
  return demoPeople.map((p) => `  ${p.email} / ${p.password} (${p.role})`);
}

export type DemoProject = {
  id: string;
  name: string;
  kind: ProjectKind;
  createdBy: string;
  members: { userId: string; role: MemberRole }[];
};

const [instructor, student1, student2, researcher] = demoPeople;

export const demoProjects: DemoProject[] = [
  {
    id: "00000000-0000-4000-8000-000000000101",
    name: "Robot Motion I",
    kind: "course",
    createdBy: instructor.id,
    members: [
      { userId: instructor.id, role: "owner" },
      { userId: student1.id, role: "editor" },
      { userId: student2.id, role: "editor" },
    ],
  },
  {
    id: "00000000-0000-4000-8000-000000000102",
    name: "Lead-arm demonstrations",
    kind: "research",
    createdBy: researcher.id,
    members: [
      { userId: researcher.id, role: "owner" },
      { userId: instructor.id, role: "viewer" },
    ],
  },
  {
    id: "00000000-0000-4000-8000-000000000103",
    name: "Aiko's sandbox",
    kind: "personal",
    createdBy: student2.id,
    members: [{ userId: student2.id, role: "owner" }],
  },
];

/**
 * The two built-in demo arms: one six-joint arm design with a gripper joint, in a light
 * variant carrying a handle for guiding by hand and a heavier one carrying a parallel
 * gripper. Invented limits for a small research arm; angles in rad, the gripper in m.
 * Each is the `arm` object of a plan document (issue 3, version 1).
 */
function demoArm(name: string, speedScale: number, gripperMaxM: number) {
  const j = (n: string, min: number, max: number, maxVelocity: number, maxAcceleration: number) => ({
    name: n,
    type: "revolute" as const,
    min,
    max,
    maxVelocity: Math.round(maxVelocity * speedScale * 100) / 100,
    maxAcceleration: Math.round(maxAcceleration * speedScale * 10) / 10,
  });
  return {
    name,
    controlRateHz: 1000,
    cautionRatio: 0.9,
    joints: [
      j("base", -3.05, 3.05, 3.2, 18),
      j("shoulder", -1.8, 1.8, 3.2, 16),
      j("elbow", -1.6, 2.9, 3.6, 20),
      j("wrist-pitch", -1.9, 1.9, 4.5, 28),
      j("wrist-roll", -3.05, 3.05, 4.5, 28),
      j("wrist-yaw", -2.9, 2.9, 5.0, 30),
      { name: "gripper", type: "prismatic" as const, min: 0, max: gripperMaxM, maxVelocity: 0.12, maxAcceleration: 1.5 },
    ],
  };
}

export const demoArms = [
  { id: "00000000-0000-4000-8000-000000000201", name: "Bench arm L (guide handle)", description: demoArm("Bench arm L (guide handle)", 1, 0.02) },
  { id: "00000000-0000-4000-8000-000000000202", name: "Bench arm H (parallel gripper)", description: demoArm("Bench arm H (parallel gripper)", 0.8, 0.045) },
] as const;
