// Everything one report shows, gathered before drawing starts: rows of the database, the
// uploaded model file and the stored result. The document code reads only this.
import type { TrussResult } from "~/engine/design/result-types";
import { designWorthReview } from "~/lib/review-request";
import { jobState, type JobState } from "~/lib/job-state";

/** The parts of the uploaded model file (docs/model-format.md) that the report prints. */
export interface ModelFile {
  name?: string;
  description?: string;
  units?: { length?: string; force?: string; mass?: string };
  dimension?: number;
  materials?: { id: string; E: number; density: number; allowableTension?: number; allowableCompression?: number }[];
  nodes?: { id: string; x: number; y: number; z?: number; fixed?: string[] }[];
  members?: { id: string; start: string; end: string; material: string; area: number; group?: string }[];
  loadCases?: { id: string; name?: string; loads: { node: string; fx?: number; fy?: number; fz?: number }[] }[];
  design?: {
    objective?: string;
    formulation?: string;
    areaBounds?: { min: number; max: number };
    groups?: { id: string; min?: number; max?: number }[];
    shape?: { id: string; min: number; max: number; moves: { node: string; axis: string; factor: number }[] }[];
    constraints?: {
      stress?: boolean;
      displacement?: { node: string; axis: string; limit: number }[];
      volume?: { max: number };
      buckling?: { sectionRatio: number; effectiveLengthFactor?: number };
    };
    solver?: { maxIterations?: number; tolerance?: number };
  };
}

export interface ReportReview {
  id: string;
  decision: "approved" | "changes-requested" | "reopened";
  comment: string;
  reviewer: string; // name, or e-mail when the name is empty
  at: Date;
}

export interface ReportData {
  job: {
    id: string;
    status: string;
    options: Record<string, unknown>;
    createdAt: Date;
    startedAt: Date | null;
    finishedAt: Date | null;
    submitter: string | null;
    attempts?: number;
  };
  project: { code: string; name: string; client?: string | null };
  model: { id: string; name: string; fileName: string; sha256: string; sizeBytes: number; uploadedAt: Date | null; file: ModelFile | null };
  result: TrussResult;
  reviews: ReportReview[]; // oldest first; the latest decides the report's state
  generatedAt: Date;
}

export type ReviewState =
  | { kind: "not-reviewed" }
  /** a run with no design to sign off (infeasible, failed): no checker is asked, nothing is issued */
  | { kind: "nothing-to-review"; state: JobState }
  | { kind: "approved"; review: ReportReview }
  | { kind: "changes-requested"; review: ReportReview };

/** `result`: the run's result, whose outcome decides whether there is a design to review at all. */
export function reviewState(reviews: ReportReview[], result?: Pick<TrussResult, "status" | "verification">): ReviewState {
  if (result && !designWorthReview(result)) return { kind: "nothing-to-review", state: jobState({ status: "succeeded", outcome: result.status }) };
  const latest = reviews[reviews.length - 1];
  // a reopened approval is withdrawn: the run waits for a new decision
  if (!latest || latest.decision === "reopened") return { kind: "not-reviewed" };
  return latest.decision === "approved" ? { kind: "approved", review: latest } : { kind: "changes-requested", review: latest };
}
