/**
 * Cursor paging of the review queue (`GET /api/v1/reviews?limit=&cursor=`) against the real test
 * database: walking the pages gives every submission once, in the queue's default order (waiting
 * first, the longest wait on top, the id breaking ties) and in each chosen column's order (its ties
 * in the waiting order); another instructor's submissions never appear on any page; a cursor that
 * is not one of this queue's, in this order, is a 400.
 */
import "./_env";
import { eq, inArray, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "@/db";
import { submissions } from "@/db/schema/courses";
import * as queueRoute from "@/app/api/v1/reviews/route";
import * as submitRoute from "@/app/api/v1/assignments/[assignmentId]/submissions/route";
import * as decisionRoute from "@/app/api/v1/reviews/[submissionId]/decision/route";
import { openApiDocument } from "@/lib/server/openapi";
import { encodeCursor } from "@/lib/server/paging";
import { encodeQueueCursor } from "@/lib/server/review-queue-paging";
import { baseMovePlan, courseWithAssignment, studentPlan } from "../courses/_fixtures";
import { call, errorOf, makeUser, sessionCookieFor, type Auth, type CallResult } from "./_helpers";

type Row = { id: string; studentName: string; verdict: string; status: string; submittedAt: string };
type Known = Row & { submittedKey: string };

/** Follows `nextCursor` from the first page to the last; returns every page's rows. */
async function walk(get: (query: string) => Promise<CallResult>, query: string, limit: number): Promise<Row[][]> {
  const pages: Row[][] = [];
  let cursor: string | null = null;
  for (let guard = 0; guard < 50; guard++) {
    const res = await get(
      `?${query}${query ? "&" : ""}limit=${limit}${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`,
    );
    expect(res.status, res.text).toBe(200);
    const body = res.body as { queue: Row[]; nextCursor: string | null };
    pages.push(body.queue);
    cursor = body.nextCursor;
    if (!cursor) return pages;
  }
  throw new Error("more than 50 pages: the cursor does not move on");
}

const byWaiting = (a: Known, b: Known) =>
  Number(a.status !== "submitted") - Number(b.status !== "submitted") ||
  (a.submittedKey < b.submittedKey ? -1 : a.submittedKey > b.submittedKey ? 1 : 0) ||
  (a.id < b.id ? -1 : 1);
const rank = (values: string[]) => (v: string) => values.indexOf(v);
const verdictRank = rank(["pass", "caution", "fault"]);

/** One instructor's course with students who submit (one plan each: a base move of the given duration). */
async function queueOf(label: string, students: { name: string; durationS: number }[]) {
  const instructor = await makeUser("instructor", `${label}-teacher`);
  const auth: Auth = { cookie: await sessionCookieFor(instructor.id) };
  const people = [];
  for (const s of students) people.push(await makeUser("student", s.name));
  const { assignment } = await courseWithAssignment(
    instructor.id,
    people.map((p) => p.id),
  );
  const ids: string[] = [];
  for (const [i, person] of people.entries()) {
    const { planId } = await studentPlan(person.id, [baseMovePlan(students[i].durationS)]);
    const res = await call(submitRoute.POST, {
      method: "POST",
      path: `/api/v1/assignments/${assignment.id}/submissions`,
      params: { assignmentId: assignment.id },
      auth: { cookie: await sessionCookieFor(person.id) },
      body: { planId, versionNumber: 1 },
    });
    expect(res.status, res.text).toBe(201);
    ids.push((res.body as { submission: { id: string } }).submission.id);
  }
  return { auth, ids };
}

async function setUp() {
  // Durations against the course's 70% of the base's 3.2 rad/s (2.24 rad/s), quintic peak 1.875 rad / T:
  // 2 s → 0.94 rad/s (pass), 0.88 s → 2.13 rad/s (over 90% of 2.24: caution), 0.73 s → 2.57 rad/s (fault).
  const mine = await queueOf("pager", [
    { name: "kai", durationS: 2 },
    { name: "kai", durationS: 0.73 },
    { name: "ana", durationS: 0.88 },
    { name: "zoe", durationS: 2 },
    { name: "bo", durationS: 0.73 },
  ]);
  const theirs = await queueOf("other", [
    { name: "ana", durationS: 2 },
    { name: "cy", durationS: 0.73 },
    { name: "dee", durationS: 2 },
  ]);
  const [k1, k2, ana, zoe, bo] = mine.ids;
  // Submission times chosen so that each order differs; k2 and bo at the same microsecond, so only the id orders them.
  const times: [string, string][] = [
    [k1, "2026-11-02 09:00:00.000001+00"],
    [k2, "2026-11-03 09:00:00.000005+00"],
    [ana, "2026-11-01 09:00:00.000000+00"],
    [zoe, "2026-11-04 09:00:00.000000+00"],
    [bo, "2026-11-03 09:00:00.000005+00"],
  ];
  for (const [id, at] of times)
    await db
      .update(submissions)
      .set({ submittedAt: sql`${at}::timestamptz` })
      .where(eq(submissions.id, id));
  // The oldest is approved and one other returned, so waiting first is not oldest first.
  for (const [id, body] of [
    [ana, { decision: "approved" }],
    [zoe, { decision: "returned", summary: "Slow the base down near the goal." }],
  ] as const) {
    const res = await call(decisionRoute.POST, {
      method: "POST",
      path: `/api/v1/reviews/${id}/decision`,
      params: { submissionId: id },
      auth: mine.auth,
      body,
    });
    expect(res.status, res.text).toBe(201);
  }
  const known: Known[] = [];
  for (const row of await db
    .select({
      id: submissions.id,
      verdict: submissions.verdict,
      status: submissions.status,
      submittedKey: sql<string>`to_char(${submissions.submittedAt} at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')`,
    })
    .from(submissions)
    .where(inArray(submissions.id, mine.ids))) {
    const i = mine.ids.indexOf(row.id);
    known.push({ ...row, studentName: `Test ${["kai", "kai", "ana", "zoe", "bo"][i]}`, submittedAt: "" });
  }
  return { mine, theirs, known };
}

describe("cursor paging of the review queue", () => {
  let f: Awaited<ReturnType<typeof setUp>>;
  beforeAll(async () => {
    f = await setUp();
  }, 60_000);
  const get = (auth: Auth) => (q: string) => call(queueRoute.GET, { path: `/api/v1/reviews${q}`, auth });

  it("the fixture's verdicts are pass, fault, caution, pass, fault as planned", () => {
    const verdicts = f.mine.ids.map((id) => f.known.find((k) => k.id === id)!.verdict);
    expect(verdicts).toEqual(["pass", "fault", "caution", "pass", "fault"]);
  });

  it("pages of 2 over 5 submissions give each once, waiting first and the longest wait on top, the id breaking a tie", async () => {
    const pages = await walk(get(f.mine.auth), "", 2);
    expect(pages.map((p) => p.length)).toEqual([2, 2, 1]);
    const ids = pages.flat().map((r) => r.id);
    const expected = [...f.known].sort(byWaiting).map((k) => k.id);
    expect(ids).toEqual(expected);
    // spelt out: k1 (waiting, 2 Nov), then k2 and bo (waiting, 3 Nov, the same microsecond) by id, then ana (approved, 1 Nov), zoe (returned, 4 Nov)
    const [k1, k2, ana, zoe, bo] = f.mine.ids;
    expect(ids).toEqual([k1, ...[k2, bo].sort(), ana, zoe]);
    const whole = (await get(f.mine.auth)("?limit=200")).body as { queue: Row[]; nextCursor: string | null };
    expect(whole.nextCursor).toBeNull();
    expect(whole.queue.map((r) => r.id)).toEqual(ids);
  });

  it("pages by student name both ways and by verdict, two at a time, ties in the waiting order", async () => {
    const byName = (dir: 1 | -1) => (a: Known, b: Known) =>
      (a.studentName < b.studentName ? -dir : a.studentName > b.studentName ? dir : 0) || byWaiting(a, b);
    for (const [query, order] of [
      ["sort=student", byName(1)],
      ["sort=student&order=asc", byName(1)],
      ["sort=student&order=desc", byName(-1)],
      [
        "sort=verdict&order=desc",
        (a: Known, b: Known) => verdictRank(b.verdict) - verdictRank(a.verdict) || byWaiting(a, b),
      ],
      [
        "sort=submittedAt&order=desc",
        (a: Known, b: Known) =>
          (a.submittedKey < b.submittedKey ? 1 : a.submittedKey > b.submittedKey ? -1 : 0) || byWaiting(a, b),
      ],
      [
        "sort=status",
        (a: Known, b: Known) =>
          rank(["submitted", "returned", "approved"])(a.status) -
            rank(["submitted", "returned", "approved"])(b.status) || byWaiting(a, b),
      ],
    ] as const) {
      const pages = await walk(get(f.mine.auth), query, 2);
      expect(
        pages.map((p) => p.length),
        query,
      ).toEqual([2, 2, 1]);
      expect(
        pages.flat().map((r) => r.id),
        query,
      ).toEqual([...f.known].sort(order).map((k) => k.id));
    }
    // spelt out for names ascending: ana, bo, kai (waiting, 2 Nov), kai (waiting, 3 Nov), zoe
    const [k1, k2, ana, zoe, bo] = f.mine.ids;
    const names = (await walk(get(f.mine.auth), "sort=student", 2)).flat().map((r) => r.id);
    expect(names).toEqual([ana, bo, k1, k2, zoe]);
  });

  it("never shows another instructor's submissions on any page, and theirs never shows mine", async () => {
    const mine = (await walk(get(f.mine.auth), "", 1)).flat().map((r) => r.id);
    expect([...mine].sort()).toEqual([...f.mine.ids].sort());
    for (const query of ["", "sort=student", "sort=verdict&order=desc"]) {
      const theirs = (await walk(get(f.theirs.auth), query, 1)).flat().map((r) => r.id);
      expect([...theirs].sort(), query).toEqual([...f.theirs.ids].sort());
    }
    // a cursor made from one of my rows, sent by the other instructor, still lists only theirs
    const mineFirst = f.known.find((k) => k.id === f.mine.ids[2])!;
    const cursor = encodeQueueCursor(null, { ...mineFirst, value: "", status: "submitted" });
    const res = await get(f.theirs.auth)(`?limit=200&cursor=${cursor}`);
    expect(res.status, res.text).toBe(200);
    for (const r of (res.body as { queue: Row[] }).queue) expect(f.theirs.ids).toContain(r.id);
  });

  it("filters and pages together: the waiting ones only, one per page", async () => {
    const pages = await walk(get(f.mine.auth), "status=submitted", 1);
    expect(pages.map((p) => p.length)).toEqual([1, 1, 1]);
    expect(pages.flat().every((r) => r.status === "submitted")).toBe(true);
  });

  it("answers 400 for a cursor that is not this queue's in this order, naming query.cursor", async () => {
    const first = (await get(f.mine.auth)("?limit=2")).body as { nextCursor: string };
    const byName = (await get(f.mine.auth)("?limit=2&sort=student")).body as { nextCursor: string };
    const row = f.known[0];
    const cases: [string, string][] = [
      ["not a cursor", ""],
      ["bm90LWpzb24", ""],
      // a plans-list cursor: a bare timestamp and an id
      [encodeCursor({ key: "2026-06-01T10:00:00.000000Z", id: row.id }), ""],
      // the default order's cursor used for a sort by name, and the other way round
      [first.nextCursor, "&sort=student"],
      [byName.nextCursor, ""],
      [byName.nextCursor, "&sort=student&order=desc"],
      // well formed but impossible: 30 February, an unknown state, an unknown verdict, an empty name
      [
        encodeQueueCursor(null, {
          submittedKey: "2026-02-30T10:00:00.000000Z",
          status: "submitted",
          value: "",
          id: row.id,
        }),
        "",
      ],
      [encodeCursor({ key: `waiting|${row.submittedKey}|pending|`, id: row.id }), ""],
      [encodeCursor({ key: `verdict.asc|${row.submittedKey}|submitted|okay`, id: row.id }), "&sort=verdict"],
      [encodeCursor({ key: `student.asc|${row.submittedKey}|submitted|`, id: row.id }), "&sort=student"],
      [encodeCursor({ key: `waiting|${row.submittedKey}|submitted|`, id: "12" }), ""],
    ];
    for (const [cursor, extra] of cases) {
      const res = await get(f.mine.auth)(`?cursor=${encodeURIComponent(cursor)}${extra}`);
      expect(res.status, `${cursor} ${extra}`).toBe(400);
      expect(errorOf(res).issues.map((i) => i.path)).toEqual(["query.cursor"]);
      expect(errorOf(res).issues[0].message).toMatch(/nextCursor of an earlier page of this queue/);
    }
    // the real cursors, in their own order, are accepted
    expect((await get(f.mine.auth)(`?limit=2&cursor=${first.nextCursor}`)).status).toBe(200);
    expect((await get(f.mine.auth)(`?limit=2&sort=student&cursor=${byName.nextCursor}`)).status).toBe(200);
  });

  it("answers 400 for a limit outside 1 to 200 and for an order without a sort", async () => {
    const zero = await get(f.mine.auth)("?limit=0");
    expect(zero.status).toBe(400);
    expect(errorOf(zero).issues).toEqual([{ path: "query.limit", message: "must be 1 or greater" }]);
    const big = await get(f.mine.auth)("?limit=201");
    expect(errorOf(big).issues).toEqual([{ path: "query.limit", message: "must be 200 or less" }]);
    const order = await get(f.mine.auth)("?order=desc");
    expect(order.status).toBe(400);
    expect(errorOf(order).issues.map((i) => i.path)).toEqual(["query.order"]);
  });

  it("answers 401 without a session", async () => {
    const res = await get(null)("?limit=2");
    expect(res.status).toBe(401);
  });

  it("is documented in OpenAPI with limit, cursor and nextCursor, sort optional (none: waiting first)", () => {
    type Op = {
      parameters: { name: string; required: boolean; schema: Record<string, unknown> }[];
      responses: Record<string, { description: string }>;
    };
    const doc = openApiDocument("http://x.test") as { paths: Record<string, { get: Op }> };
    const op = doc.paths["/reviews"].get;
    const params = Object.fromEntries(op.parameters.map((p) => [p.name, p]));
    expect(Object.keys(params).sort()).toEqual(
      ["assignmentId", "courseId", "cursor", "limit", "order", "sort", "status", "verdict"].sort(),
    );
    expect(params.limit.schema).toMatchObject({ type: "integer", minimum: 1, maximum: 200, default: 50 });
    expect(params.sort.required).toBe(false);
    expect(params.sort.schema).not.toHaveProperty("default");
    expect(op.responses["200"].description).toContain("nextCursor");
  });
});
