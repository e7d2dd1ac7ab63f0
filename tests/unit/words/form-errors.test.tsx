// @vitest-environment happy-dom
import { act, cleanup, fireEvent, render, screen } from "@testing-library/react";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { afterEach, describe, expect, it } from "vitest";
import { TextField } from "@/components/ui/field";
import { applyApiIssues, fieldMessage, formFailure, toFormPath } from "@/components/ui/form";
import { formatPath } from "@/kinematics";
import { ApiError, type FieldIssue } from "@/lib/client/api-client";
import { createTokenSchema } from "@/lib/shared/schemas/api";

afterEach(cleanup);

/** The problem list the API answers for a body, built the way lib/server/route.ts builds it (zod issues, formatPath). */
function apiProblems(body: unknown): FieldIssue[] {
  const parsed = createTokenSchema.safeParse(body);
  if (parsed.success) throw new Error("expected the body to be refused");
  return parsed.error.issues.map((i) => ({ path: formatPath(i.path, "(body)"), message: i.message }));
}

function TokenFields({ error }: { error: ApiError }) {
  const form = useForm<{ name: string; expiresInDays?: number }>({ defaultValues: { name: "" } });
  const [rest, setRest] = useState<string | undefined>();
  return (
    <form>
      <TextField label="Name" error={fieldMessage("The name", form.formState.errors.name)} {...form.register("name")} />
      <TextField
        label="Expires after (days)"
        error={fieldMessage("The expiry", form.formState.errors.expiresInDays)}
        {...form.register("expiresInDays")}
      />
      <button
        type="button"
        onClick={() =>
          setRest(formFailure(error, applyApiIssues(error.issues, form.setError, ["name", "expiresInDays"])))
        }
      >
        answer
      </button>
      {rest ? <p role="alert">{rest}</p> : null}
    </form>
  );
}

describe("API field errors in a react-hook-form form", () => {
  it("shows the API's own words under the field the problem names, linked to its input", async () => {
    const issues = apiProblems({ name: "x".repeat(81), expiresInDays: 400 });
    expect(issues.map((i) => i.path).sort()).toEqual(["expiresInDays", "name"]);
    render(
      <TokenFields error={new ApiError(400, "bad_request:validation", "The request body is not valid.", issues)} />,
    );
    await act(async () => fireEvent.click(screen.getByRole("button", { name: "answer" })));
    const name = screen.getByLabelText("Name");
    expect(name.getAttribute("aria-invalid")).toBe("true");
    const described = document.getElementById(name.getAttribute("aria-describedby")!.split(" ").at(-1)!);
    expect(described?.textContent).toBe(`The name ${issues.find((i) => i.path === "name")!.message}.`);
    expect(screen.getByLabelText("Expires after (days)").getAttribute("aria-invalid")).toBe("true");
    expect(screen.queryByRole("alert")).toBeNull();
  });

  it("puts a problem on a field outside the form at the form's foot, with its path", async () => {
    const error = new ApiError(422, "unprocessable:arm", "The arm is not one of this project's.", [
      { path: "armId", message: "is not an arm of this project" },
    ]);
    render(<TokenFields error={error} />);
    await act(async () => fireEvent.click(screen.getByRole("button", { name: "answer" })));
    expect(screen.getByRole("alert").textContent).toBe("armId is not an arm of this project");
    expect(screen.getByLabelText("Name").getAttribute("aria-invalid")).toBe("false");
  });

  it("maps the API's index paths to react-hook-form's and strips a prefix", () => {
    expect(toFormPath("moves[2].duration")).toBe("moves.2.duration");
    const set: string[] = [];
    const rest = applyApiIssues(
      [
        { path: "document.moves[2].duration", message: "must be 0 or greater" },
        { path: "note", message: "must be at most 500 characters" },
      ],
      (path) => set.push(String(path)),
      ["moves.2.duration"],
      { prefix: "document" },
    );
    expect(set).toEqual(["moves.2.duration"]);
    expect(rest).toEqual([{ path: "note", message: "must be at most 500 characters" }]);
  });
});
