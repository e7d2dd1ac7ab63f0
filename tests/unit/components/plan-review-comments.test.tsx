// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import {
  decidedSubmissionOf,
  FaultApprovalNotice,
  pinTarget,
  returnedSubmissionOf,
  ReviewCommentList,
  type CommentPin,
  type ReviewDetail,
  type SubmissionSummary,
} from "@/components/review/plan-review-comments";
import { timelineOf } from "@/kinematics/motion/timeline";
import { demoPlan, pose } from "./helpers";

afterEach(cleanup);

const planId = "00000000-0000-4000-8000-0000000000aa";
const sub = (over: Partial<SubmissionSummary>): SubmissionSummary => ({
  id: "s1",
  planId,
  status: "returned",
  attempt: 1,
  assignmentTitle: "Reach without faults",
  submittedAt: "2025-03-01T10:00:00.000Z",
  ...over,
});

const detail: ReviewDetail = {
  submission: {
    id: "s2",
    status: "returned",
    review: { decision: "returned", summary: "Slow the reach down and submit again.", faultApprovalReason: null },
  },
  comments: [
    {
      id: "c1",
      body: "The base runs above 70% of its speed here; lengthen this move.",
      authorName: "Instructor",
      moveIndex: 1,
      jointIndex: 0,
      timeS: 2.375,
    },
    { id: "c2", body: "Start lower.", authorName: "Instructor", moveIndex: null, jointIndex: null, timeS: null },
  ],
};

describe("review comments in the bench", () => {
  it("shows the comments only while the plan's latest submission is the returned one", () => {
    const first = sub({ id: "s1", status: "returned", submittedAt: "2025-03-01T10:00:00.000Z" });
    const other = sub({ id: "x", planId: "another-plan", status: "returned", submittedAt: "2025-03-09T10:00:00.000Z" });
    expect(returnedSubmissionOf([first, other], planId)?.id).toBe("s1");
    // resubmitted after the return: the newer attempt waits for review, so the old comments hide
    const resubmitted = sub({ id: "s3", status: "submitted", attempt: 2, submittedAt: "2025-03-05T10:00:00.000Z" });
    expect(returnedSubmissionOf([first, resubmitted, other], planId)).toBeUndefined();
    expect(returnedSubmissionOf([sub({ status: "approved" })], planId)).toBeUndefined();
    expect(returnedSubmissionOf([], planId)).toBeUndefined();
  });

  it("lists the instructor's summary and each comment with its move, joint and time", () => {
    render(
      <ReviewCommentList
        returned={sub({ id: "s2", attempt: 2 })}
        detail={detail}
        joints={["base", "shoulder"]}
        onJump={() => {}}
      />,
    );
    const section = screen.getByRole("region", { name: "Review comments" });
    expect(within(section).getByText(/Reach without faults, attempt 2: returned\. Slow the reach down/)).toBeTruthy();
    // moveIndex 1 is the second move: screens count moves from 1 (PRODUCT.md, numbering)
    expect(within(section).getByText("Move 2 · base · t = 2.375 s · Instructor")).toBeTruthy();
    expect(within(section).getByText("Whole plan · Instructor")).toBeTruthy();
    expect(within(section).getByRole("link", { name: "Open review" }).getAttribute("href")).toBe("/reviews/s2");
  });

  it("clicking a comment hands its pin to the bench", () => {
    const pins: CommentPin[] = [];
    render(
      <ReviewCommentList returned={sub({ id: "s2" })} detail={detail} joints={["base"]} onJump={(p) => pins.push(p)} />,
    );
    fireEvent.click(screen.getByRole("button", { name: /lengthen this move/ }));
    fireEvent.click(screen.getByRole("button", { name: /Start lower/ }));
    expect(pins).toEqual([
      { moveIndex: 1, jointIndex: 0, timeS: 2.375 },
      { moveIndex: null, jointIndex: null, timeS: null },
    ]);
  });

  it("the bench seeks to the pinned time, else the pinned move's start, and drops moves that are gone", () => {
    const plan = demoPlan([
      { goal: pose(0.5), duration: 2 },
      { goal: pose(0.5, 0.4), duration: 1.5 },
    ]);
    const tl = timelineOf(plan);
    const n = plan.arm.joints.length;
    expect(pinTarget({ moveIndex: 1, jointIndex: 0, timeS: 2.375 }, tl.startS, tl.moveCount, n)).toEqual({
      timeS: 2.375,
      move: 1,
      joint: 0,
    });
    expect(pinTarget({ moveIndex: 1, jointIndex: null, timeS: null }, tl.startS, tl.moveCount, n).timeS).toBeCloseTo(
      2,
      12,
    );
    // the student deleted moves since: move 5 and joint 40 do not exist, the time still does
    expect(pinTarget({ moveIndex: 5, jointIndex: 40, timeS: 1.2 }, tl.startS, tl.moveCount, n)).toEqual({
      timeS: 1.2,
      move: null,
      joint: null,
    });
    expect(pinTarget({ moveIndex: null, jointIndex: null, timeS: null }, tl.startS, tl.moveCount, n)).toEqual({
      timeS: 0,
      move: null,
      joint: null,
    });
  });

  it("shows an approval given despite faults with the reviewer's reason, and nothing for a clean approval", () => {
    const approved = sub({ id: "s4", status: "approved", submittedAt: "2025-03-10T10:00:00.000Z" });
    expect(decidedSubmissionOf([sub({}), approved], planId)?.id).toBe("s4");
    expect(decidedSubmissionOf([sub({ status: "submitted" })], planId)).toBeUndefined();
    const withReason: ReviewDetail = {
      submission: {
        id: "s4",
        status: "approved",
        review: { decision: "approved", summary: "", faultApprovalReason: "The jump is the point of the exercise." },
      },
      comments: [],
    };
    render(<FaultApprovalNotice detail={withReason} />);
    const section = screen.getByRole("region", { name: "Approved with faults" });
    expect(within(section).getByText(/Reason given: The jump is the point of the exercise\./)).toBeTruthy();
    expect(within(section).getByText(/faults are still in the plan/)).toBeTruthy();
    cleanup();
    const clean: ReviewDetail = {
      submission: {
        id: "s5",
        status: "approved",
        review: { decision: "approved", summary: "", faultApprovalReason: null },
      },
      comments: [],
    };
    render(<FaultApprovalNotice detail={clean} />);
    expect(screen.queryByRole("region", { name: "Approved with faults" })).toBeNull();
  });
});
