// What the job page hands its components: plain, serializable data from the loader.
export interface ReviewView {
  id: string;
  decision: "approved" | "changes-requested" | "reopened";
  comment: string;
  reviewerName: string;
  createdAt: string | number | Date;
}

export interface LiveJob {
  id: string;
  status: string;
  outcome: string | null;
  progress: { iteration: number | null; objective: number | null; maxViolation: number | null; kktResidual: number | null } | null;
}
