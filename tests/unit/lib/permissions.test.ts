import { describe, expect, it } from "vitest";
import {
  archivedProjectAllows,
  assertKeepsAnOwner,
  canCourse,
  canProject,
  canSite,
  capabilities,
  coursePermissions,
  projectPermissions,
  sitePermissions,
  visibleJoinCode,
  type Actor,
} from "@/lib/server/permissions";

const actor = (siteRole: Actor["siteRole"]): Actor => ({ userId: "u", siteRole, via: "session" });

describe("permission tables", () => {
  it("grow strictly from viewer to editor to owner", () => {
    const [viewer, editor, owner] = [projectPermissions.viewer, projectPermissions.editor, projectPermissions.owner];
    for (const a of viewer) expect(editor.has(a), a).toBe(true);
    for (const a of editor) expect(owner.has(a), a).toBe(true);
    expect(editor.size).toBeGreaterThan(viewer.size);
    expect(owner.size).toBeGreaterThan(editor.size);
  });

  it("give viewers no write and editors no owner-only action", () => {
    expect(canProject({ role: "viewer", archived: false }, "version:create")).toBe(false);
    expect(canProject({ role: "editor", archived: false }, "version:create")).toBe(true);
    expect(canProject({ role: "editor", archived: false }, "member:manage")).toBe(false);
    expect(canProject({ role: "owner", archived: false }, "member:manage")).toBe(true);
  });

  it("leave an archived project readable, and changeable by nobody until un-archived", () => {
    for (const action of projectPermissions.owner) {
      expect(canProject({ role: "owner", archived: true }, action), action).toBe(archivedProjectAllows.has(action));
    }
    expect(canProject({ role: "owner", archived: true }, "plan:read")).toBe(true);
    expect(canProject({ role: "owner", archived: true }, "plan:create")).toBe(false);
    expect(canProject({ role: "owner", archived: true }, "project:archive")).toBe(true);
    expect(canProject({ role: "viewer", archived: true }, "project:archive")).toBe(false);
  });

  it("keep user management to admins and course creation to instructors and admins", () => {
    expect(
      (["student", "researcher", "instructor", "admin"] as const).filter((r) => canSite(actor(r), "user:manage")),
    ).toEqual(["admin"]);
    expect(
      (["student", "researcher", "instructor", "admin"] as const).filter((r) =>
        canSite(actor(r), "project:create-course"),
      ),
    ).toEqual(["instructor", "admin"]);
    for (const role of Object.keys(sitePermissions) as Actor["siteRole"][])
      expect(canSite(actor(role), "check:run")).toBe(true);
  });
});

describe("course permission table", () => {
  it("keeps reviewing, grades and the roster to instructors and submitting to students", () => {
    for (const action of [
      "review:decide",
      "review:comment",
      "grades:export",
      "roster:read",
      "roster:manage",
      "submission:read-all",
      "course:read-join-code",
    ] as const) {
      expect(canCourse("instructor", action), action).toBe(true);
      expect(canCourse("student", action), action).toBe(false);
    }
    expect(canCourse("student", "submission:create")).toBe(true);
    expect(canCourse("instructor", "submission:create")).toBe(false);
    expect([...coursePermissions.student].every((a) => a !== "course:manage")).toBe(true);
  });
});

describe("capabilities", () => {
  const student = actor("student");

  it("let a project member edit only when the role writes and the project is not archived", () => {
    expect(capabilities(student, { kind: "project", role: "viewer", archived: false }).canEdit).toBe(false);
    expect(capabilities(student, { kind: "project", role: "editor", archived: false }).canEdit).toBe(true);
    expect(capabilities(student, { kind: "project", role: "owner", archived: true }).canEdit).toBe(false);
    expect(capabilities(student, { kind: "project", role: "owner", archived: true }).canArchive).toBe(true);
    expect(capabilities(student, { kind: "project", role: "editor", archived: false }).canManageMembers).toBe(false);
  });

  it("answer every project role and archived state the same as the table the handlers consult", () => {
    for (const role of ["viewer", "editor", "owner"] as const) {
      for (const archived of [false, true]) {
        const can = capabilities(student, { kind: "project", role, archived });
        expect(can.canEdit, `${role} ${archived}`).toBe(
          canProject({ role, archived }, "version:create") && canProject({ role, archived }, "plan:create"),
        );
        expect(can.canManageMembers).toBe(canProject({ role, archived }, "member:manage"));
        expect(can.canReadAudit).toBe(canProject({ role, archived }, "audit:read"));
      }
    }
  });

  it("give instructors the course's review tools and students the submit button", () => {
    const teach = capabilities(student, { kind: "course", role: "instructor" });
    const learn = capabilities(student, { kind: "course", role: "student" });
    expect([teach.canManage, teach.canReview, teach.canSeeJoinCode, teach.canExportGrades, teach.canSubmit]).toEqual([
      true,
      true,
      true,
      true,
      false,
    ]);
    expect([learn.canManage, learn.canReview, learn.canSeeJoinCode, learn.canExportGrades, learn.canSubmit]).toEqual([
      false,
      false,
      false,
      false,
      true,
    ]);
  });

  it("close comments and decisions once a submission is decided, and never open them to its student", () => {
    expect(capabilities(student, { kind: "submission", viewerRole: "instructor", status: "submitted" })).toEqual({
      canComment: true,
      canDecide: true,
    });
    expect(capabilities(student, { kind: "submission", viewerRole: "instructor", status: "approved" })).toEqual({
      canComment: false,
      canDecide: false,
    });
    expect(capabilities(student, { kind: "submission", viewerRole: "student", status: "submitted" })).toEqual({
      canComment: false,
      canDecide: false,
    });
  });

  it("let instructors and admins create courses at site level, as the site table says", () => {
    for (const role of ["student", "researcher", "instructor", "admin"] as const) {
      expect(capabilities(actor(role), { kind: "site" }).canCreateCourse, role).toBe(
        canSite(actor(role), "project:create-course"),
      );
    }
    expect(capabilities(actor("admin"), { kind: "site" }).canManageUsers).toBe(true);
    expect(capabilities(actor("instructor"), { kind: "site" }).canManageUsers).toBe(false);
  });
});

describe("join-code visibility", () => {
  it("shows the code to the course's instructors and to nobody else", () => {
    expect(visibleJoinCode({ role: "instructor", joinCode: "ABCD2345" })).toBe("ABCD2345");
    expect(visibleJoinCode({ role: "student", joinCode: "ABCD2345" })).toBeNull();
  });
});

describe("the last-owner rule", () => {
  it("refuses removing or demoting the only owner with unprocessable:last-owner", () => {
    expect(() => assertKeepsAnOwner({ currentRole: "owner", nextRole: null, ownerCount: 1 })).toThrow(
      expect.objectContaining({ code: "unprocessable:last-owner" }),
    );
    expect(() => assertKeepsAnOwner({ currentRole: "owner", nextRole: "editor", ownerCount: 1 })).toThrow(
      /at least one owner/,
    );
  });

  it("allows it when another owner remains, and any change that keeps the owner an owner", () => {
    expect(() => assertKeepsAnOwner({ currentRole: "owner", nextRole: null, ownerCount: 2 })).not.toThrow();
    expect(() => assertKeepsAnOwner({ currentRole: "owner", nextRole: "owner", ownerCount: 1 })).not.toThrow();
    expect(() => assertKeepsAnOwner({ currentRole: "editor", nextRole: null, ownerCount: 1 })).not.toThrow();
    expect(() => assertKeepsAnOwner({ currentRole: undefined, nextRole: "viewer", ownerCount: 1 })).not.toThrow();
  });
});
