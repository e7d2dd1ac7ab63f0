import "./_env";
import { readFileSync } from "node:fs";
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { armRevisions, arms } from "@/db/schema";
import * as importRoute from "@/app/api/v1/projects/[projectId]/arms/import/route";
import * as projectsRoute from "@/app/api/v1/projects/route";
import { getObject } from "@/lib/server/storage";
import { call, demoArm, errorOf, makeUser, tokenFor, type Auth } from "./_helpers";

let auth: Auth;
let projectId: string;
const urdf = readFileSync("kinematics/arm/presets/bench-arm-l.urdf", "utf8");

function post(body: string, query = "", type = "application/xml") {
  return call(importRoute.POST, {
    method: "POST",
    path: `/api/v1/projects/${projectId}/arms/import${query}`,
    params: { projectId },
    auth,
    rawBody: body,
    headers: { "content-type": type },
  });
}

beforeAll(async () => {
  const u = await makeUser("researcher");
  auth = { bearer: await tokenFor(u.id) };
  const p = await call(projectsRoute.POST, {
    method: "POST",
    path: "/api/v1/projects",
    auth,
    body: { name: "URDF lab" },
  });
  projectId = (p.body as { project: { id: string } }).project.id;
});

describe("URDF import", () => {
  it("turns the demo arm's URDF into a custom arm with the six arm joints and limits of its JSON twin, keeping the file", async () => {
    const res = await post(urdf, "?name=Imported%20L");
    expect(res.status, res.text).toBe(201);
    const body = res.body as {
      arm: { id: string };
      revision: {
        description: { joints: { name: string; min: number; max: number; maxVelocity: number }[] };
        urdfKey: string;
      };
    };
    const joints = body.revision.description.joints.map((j) => [j.name, j.min, j.max, j.maxVelocity]);
    // The URDF describes the six arm joints (the gripper is not in it); they match the JSON description.
    expect(joints).toEqual(demoArm.description.joints.slice(0, 6).map((j) => [j.name, j.min, j.max, j.maxVelocity]));
    expect(new TextDecoder().decode(await getObject(body.revision.urdfKey))).toBe(urdf);
  });

  it("refuses a second arm with the same name (409) and keeps only the first", async () => {
    const res = await post(urdf, "?name=Imported%20L");
    expect(res.status).toBe(409);
    expect(await db.$count(arms, eq(arms.projectId, projectId))).toBe(1);
  });

  it.each([
    ["text that is not XML", "<robot name='x'><link name='a'>", "application/xml", 422],
    ["a robot without moving joints", "<robot name='x'><link name='a'/></robot>", "application/xml", 422],
    ["a JSON body", "{}", "application/json", 415],
  ])("refuses %s and creates no arm", async (_what, body, type, status) => {
    const before = await db.$count(armRevisions);
    const res = await post(body, "", type);
    expect(res.status, res.text).toBe(status);
    if (status === 422) expect(errorOf(res).issues.length).toBeGreaterThan(0);
    expect(await db.$count(armRevisions)).toBe(before);
  });
});
