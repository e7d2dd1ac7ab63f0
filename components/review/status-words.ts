/** A submission's state, in the one wording every screen uses for it. */
export type SubmissionStatus = "submitted" | "returned" | "approved";

export const submissionStatusWords: Record<SubmissionStatus, string> = {
  submitted: "Waiting for review",
  returned: "Returned with comments",
  approved: "Approved",
};
