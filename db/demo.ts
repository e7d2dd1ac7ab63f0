/**
 * The invented demo scenario: a community college's motion lab. Every name, address and
 * number here is made up for the demo. db/seed.ts writes it; `npm start` prints the sign-ins.
 * Fixed ids keep the seed idempotent: a second run updates the same rows.
 */
import armH from "../kinematics/arm/presets/bench-arm-h.json";
import armL from "../kinematics/arm/presets/bench-arm-l.json";
import type { MemberRole, ProjectKind } from "./schema/projects";
import type { SiteRole } from "./schema/users";

export type DemoPerson = { id: string; email: string; name: string; password: string; role: SiteRole };

export const demoPeople = [
  {
    id: "00000000-0000-4000-8000-000000000001",
    email: "ines.varga@example.com",
    name: "Ines Varga",
    password: "bench-instructor-01",
    role: "instructor",
  },
  {
    id: "00000000-0000-4000-8000-000000000002",
    email: "tomas.reyes@example.com",
    name: "Tomas Reyes",
    password: "bench-student-01",
    role: "student",
  },
  {
    id: "00000000-0000-4000-8000-000000000003",
    email: "aiko.marsh@example.com",
    name: "Aiko Marsh",
    password: "bench-student-02",
    role: "student",
  },
  {
    id: "00000000-0000-4000-8000-000000000004",
    email: "jun.halloran@example.com",
    name: "Jun Halloran",
    password: "bench-research-01",
    role: "researcher",
  },
  {
    id: "00000000-0000-4000-8000-000000000005",
    email: "lab.admin@example.com",
    name: "Lab Admin",
    password: "bench-admin-0001",
    role: "admin",
  },
] as const satisfies readonly DemoPerson[];

/** The lines `npm start` prints after seeding: `  email / password (role)`, then the course's join code when given. */
export function demoSignInLines(joinCode?: string): string[] {
  const lines = demoPeople.map((p) => `  ${p.email} / ${p.password} (${p.role})`);
  // Has " / " like the sign-in lines, which scripts/start.sh picks out of the seed output.
  if (joinCode) lines.push(`  ${demoCourseTitle} join code: ${joinCode} / link: /courses/join?code=${joinCode}`);
  return lines;
}

const demoCourseTitle = "Robot Motion I";

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
    name: "Hand-guided demonstrations",
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
 * The two built-in demo arms, designed for this demo (kinematics/arm/presets/*.json, shared with the
 * engine's tests): one six-joint arm with a gripper joint, in a light variant carrying a handle for
 * guiding by hand and a heavier one carrying a parallel gripper. Each file is the `arm` object of a
 * plan document.
 */
export const demoArms = [
  { id: "00000000-0000-4000-8000-000000000201", name: armL.name, description: armL },
  { id: "00000000-0000-4000-8000-000000000202", name: armH.name, description: armH },
] as const;

export type DemoPlan = {
  id: string;
  projectId: string;
  armId: string;
  name: string;
  authorId: string;
  /** One entry per version, oldest first: the start pose and moves of the plan document. */
  versions: {
    note: string;
    start: number[];
    moves: { goal: number[]; duration: number; shape?: "cubic" | "quintic" | "trapezoid" }[];
  }[];
};

const [course, research] = demoProjects;
const [armLight, armHeavy] = demoArms;
const home = [0, 0, 0, 0, 0, 0, 0.01];
const reach = [1.2, -0.4, 0.8, 0.3, 0, 0.5, 0.01];

/**
 * Demo plans covering every verdict. Durations were chosen against the engine: 0.74 s is just
 * above the 0.703 s shortest safe duration of the reach (a caution at 95% of the base's speed
 * limit); the heavy arm's 0.4 s move faults and its second version is stretched until it passes.
 */
export const demoPlans: DemoPlan[] = [
  {
    id: "00000000-0000-4000-8000-000000000301",
    projectId: course.id,
    armId: armLight.id,
    name: "Gentle pose change",
    authorId: student1.id,
    versions: [
      {
        note: "Two seconds, quintic",
        start: home,
        moves: [{ goal: [0.4, -0.3, 0.6, 0.2, 0, 0.3, 0.015], duration: 2 }],
      },
    ],
  },
  {
    id: "00000000-0000-4000-8000-000000000302",
    projectId: course.id,
    armId: armLight.id,
    name: "Fast reach, just long enough",
    authorId: student1.id,
    versions: [
      { note: "First try at one second", start: home, moves: [{ goal: reach, duration: 1 }] },
      { note: "Trimmed to 0.74 s", start: home, moves: [{ goal: reach, duration: 0.74 }] },
    ],
  },
  {
    id: "00000000-0000-4000-8000-000000000303",
    projectId: course.id,
    armId: armLight.id,
    name: "Instant swing",
    authorId: student2.id,
    versions: [
      { note: "Duration 0 across 1.2 rad", start: home, moves: [{ goal: [1.2, 0, 0, 0, 0, 0, 0.01], duration: 0 }] },
    ],
  },
  {
    id: "00000000-0000-4000-8000-000000000304",
    projectId: course.id,
    armId: armLight.id,
    name: "Reach down to the table",
    authorId: student2.id,
    versions: [
      {
        note: "Lean forward, then down",
        start: home,
        moves: [
          { goal: [0, 0.6, 0.6, 0.3, 0, 0, 0.01], duration: 2 },
          { goal: [0, 1.2, 1.2, 0.3, 0, 0, 0.01], duration: 2 },
        ],
      },
    ],
  },
  {
    id: "00000000-0000-4000-8000-000000000305",
    projectId: research.id,
    armId: armHeavy.id,
    name: "Replay pick, heavy gripper",
    authorId: researcher.id,
    versions: [
      {
        note: "Copied from the light arm at 0.4 s",
        start: [0, 0, 0, 0, 0, 0, 0.02],
        moves: [{ goal: [1.0, -0.5, 0.9, 0.2, 0, 0.4, 0.03], duration: 0.4 }],
      },
      {
        note: "Stretched for the heavier arm",
        start: [0, 0, 0, 0, 0, 0, 0.02],
        moves: [{ goal: [1.0, -0.5, 0.9, 0.2, 0, 0.4, 0.03], duration: 1.2 }],
      },
    ],
  },
];

/**
 * A recording made while guiding the light arm by hand: 4 s at 250 Hz of a slow reach, with three
 * single-sample glitches of 0.02 rad on the base that the stream check flags as jumps to repair.
 */
export const demoRecording = {
  id: "00000000-0000-4000-8000-000000000401",
  projectId: research.id,
  armId: armLight.id,
  name: "Hand-guided reach",
  createdBy: researcher.id,
  objectKey: `recordings/${research.id}/demo-guided-reach.csv`,
  csv(): string {
    const names = armLight.description.joints.map((j) => j.name);
    const rows = [`t,${names.join(",")}`];
    const glitches = new Set([240, 520, 810]);
    for (let k = 0; k <= 1000; k++) {
      const t = k / 250;
      const s = (1 - Math.cos((Math.PI * t) / 4)) / 2; // a smooth 0 → 1 over 4 s
      const base = 0.6 * s + (glitches.has(k) ? 0.02 : 0);
      const pose = [base, -0.3 * s, 0.5 * s, 0.2 * s, 0, 0.1 * s, 0.01];
      rows.push([t.toFixed(3), ...pose.map((v) => v.toFixed(6))].join(","));
    }
    return rows.join("\n") + "\n";
  },
};

export type DemoAssignment = {
  id: string;
  title: string;
  instructions: string;
  /** Due this many days after the seed first writes it (moved on again once it has passed). */
  dueInDays: number;
  /** Pose per joint of the light arm (rad; the gripper in m), or omitted. */
  requiredStart?: number[];
  requiredGoals?: number[][];
};

/**
 * The demo course on the course project: the instructor teaches it, Aiko is enrolled, Tomas joins
 * with the code during the demo. First runs are checked at 70% of each joint's maximum speed, on
 * revision 1 of the light arm.
 */
export const demoCourse = {
  id: "00000000-0000-4000-8000-000000000501",
  title: demoCourseTitle,
  term: "Autumn",
  /** Eight letters and digits from the join-code alphabet (no 0/O, 1/I/L look-alikes). */
  joinCode: "BENCH247",
  projectId: demoProjects[0].id,
  armId: armLight.id,
  armRevision: 1,
  instructorId: instructor.id,
  studentIds: [student2.id],
  limits: { speedPercent: 70 },
  assignments: [
    {
      id: "00000000-0000-4000-8000-000000000511",
      title: "Gentle pose change",
      instructions:
        "Start at the home pose and reach any pose in one move that passes at 70% of each joint's maximum speed.",
      dueInDays: 14,
      requiredStart: [0, 0, 0, 0, 0, 0, 0.01],
    },
    {
      id: "00000000-0000-4000-8000-000000000512",
      title: "Reach without faults",
      instructions:
        "Reach the pose below as fast as the course's limits allow, without a fault. Report the shortest safe duration you found.",
      dueInDays: 21,
      requiredGoals: [[1.2, -0.4, 0.8, 0.3, 0, 0.5, 0.01]],
    },
  ] satisfies DemoAssignment[],
};
