"use client";
/**
 * The recordings page's session hook: one reducer (recording-session.ts) plus the work that feeds it —
 * reading a file with progress, the engine's recording scan, repair, the plan preview, keeping the
 * original in the project and saving the plan.
 */
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useReducer } from "react";
import { describeRecordingProblem, repairStream, scanRecording, streamCheck } from "@/kinematics";
import { api, uploadRecording, type RecordingDto } from "@/lib/client/api-client";
import { queryKeys } from "@/lib/client/query-keys";
import { planFromRecording } from "./plan-from-recording";
import { readWithProgress } from "./read-file";
import { initialSession, sessionReducer, type RecordingArm } from "./recording-session";

/** The session of the recordings page for one project. */
export function useRecordingSession({
  projectId,
  arms,
  stored,
}: {
  projectId: string;
  arms: RecordingArm[];
  stored: RecordingDto[];
}) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [state, dispatch] = useReducer(sessionReducer, arms[0]?.id ?? "", initialSession);
  const chosen = arms.find((a) => a.id === state.armId);
  const storedList = useQuery({
    queryKey: queryKeys.recordings(projectId),
    queryFn: () => api.listRecordings(projectId),
    initialData: stored,
  });

  const upload = useMutation({
    mutationFn: () => {
      if (!state.file || !chosen) throw new Error("choose a file first");
      dispatch({ type: "upload-progress", fraction: 0 });
      return uploadRecording(
        projectId,
        state.file,
        { name: state.file.name.slice(0, 120), armId: chosen.id },
        (fraction) => dispatch({ type: "upload-progress", fraction }),
      );
    },
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: queryKeys.recordings(projectId) }),
  });

  const read = async (file: File) => {
    if (!chosen) return;
    dispatch({ type: "read-start", file });
    upload.reset();
    const bytes = await readWithProgress(file, (fraction) => dispatch({ type: "read-progress", fraction }));
    const t0 = performance.now();
    const scanned = scanRecording(chosen.arm, bytes);
    if ("problems" in scanned) {
      dispatch({ type: "refused", problems: scanned.problems.map(describeRecordingProblem) });
      return;
    }
    dispatch({
      type: "loaded",
      loaded: { fileName: file.name, sizeBytes: file.size, ...scanned, checkMs: performance.now() - t0 },
    });
  };

  const openStored = async (r: RecordingDto) => {
    const res = await fetch(api.recordingFileUrl(r.id));
    if (!res.ok) {
      dispatch({
        type: "refused",
        problems: [
          res.status === 404
            ? "The stored file is no longer there (it may have been deleted); reload the page to see the current recordings."
            : res.status === 401 || res.status === 403
              ? "You no longer have access to this recording; sign in again, or ask the project's owner for access."
              : `The stored file could not be loaded (the server answered ${res.status}); try again in a moment.`,
        ],
      });
      return;
    }
    const blob = await res.blob();
    await read(new File([blob], r.name.endsWith(".csv") ? r.name : `${r.name}.csv`, { type: "text/csv" }));
  };

  const repair = () => {
    if (!state.loaded || !chosen) return;
    const r = repairStream(chosen.arm, state.loaded.recording);
    dispatch({
      type: "repaired",
      repaired: { recording: r.recording, report: streamCheck(chosen.arm, r.recording), maxDeviation: r.maxDeviation },
      planPreview: planFromRecording(chosen.arm, r.recording, state.spacingS),
    });
  };

  const setSpacing = (spacingS: number) => {
    const planPreview =
      chosen && state.repaired ? planFromRecording(chosen.arm, state.repaired.recording, spacingS) : state.planPreview;
    dispatch({ type: "spacing", spacingS, planPreview });
  };

  const save = useMutation({
    mutationFn: async () => {
      if (!state.planPreview || !chosen) throw new Error("repair the recording first");
      const created = await api.createPlan(projectId, { name: state.planName.trim(), armId: chosen.id });
      await api.saveVersion(created.id, {
        baseVersion: 0,
        armRevision: chosen.revision,
        document: state.planPreview.plan,
        note: `From recording ${state.loaded?.fileName ?? ""}, repaired (rate-limited), waypoints every ${state.spacingS} s`,
      });
      return created.id;
    },
    onSuccess: (planId) => router.push(`/projects/${projectId}/plans/${planId}`),
  });

  return { state, dispatch, chosen, storedList: storedList.data, upload, save, read, openStored, repair, setSpacing };
}

/** What the panels get from the session hook. */
export type RecordingSessionApi = ReturnType<typeof useRecordingSession>;
