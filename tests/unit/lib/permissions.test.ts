import { describe, expect, it } from "vitest";
import { archivedProjectAllows, canProject, canSite, projectPermissions, sitePermissions, type Actor } from "@/lib/server/permissions";

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
    expect((["student", "researcher", "instructor", "admin"] as const).filter((r) => canSite(actor(r), "user:manage"))).toEqual(["admin"]);
    expect((["student", "researcher", "instructor", "admin"] as const).filter((r) => canSite(actor(r), "project:create-course"))).toEqual(["instructor", "admin"]);
    for (const role of Object.keys(sitePermissions) as Actor["siteRole"][]) expect(canSite(actor(role), "check:run")).toBe(true);
  });
});
