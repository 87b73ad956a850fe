// Options an engineer may set when queueing a run; shared by the API, the queue form and the
// worker. Every field is optional: the model's own design block supplies the defaults.
import { z } from "zod";

export const jobOptionsSchema = z
  .object({
    formulation: z.enum(["nested", "simultaneous"]).optional(),
    objective: z.enum(["mass", "compliance"]).optional(),
    maxIterations: z.number().int().min(1).max(5000).optional(),
    tolerance: z.number().positive().max(1e-2).optional(),
    /** overrides every displacement limit of the model (model length units) */
    displacementLimit: z.number().positive().optional(),
    /** overrides the volume limit (model length units cubed) */
    volumeMax: z.number().positive().optional(),
    /** switch the stress / buckling checks on or off against the model's design block */
    stress: z.boolean().optional(),
    buckling: z.boolean().optional(),
    /** starting designs to run, the best kept (multi-start.ts); default 6 up to 300 variables, else 1 */
    starts: z.number().int().min(1).max(12).optional(),
  })
  .strict();

export type JobOptions = z.infer<typeof jobOptionsSchema>;
