// Object keys in the bucket. A result is keyed by its job alone, so a job that ran twice
// (a worker died after writing, before recording) overwrites the same object: stored once.
export const modelFileKey = (modelId: string) => `models/${modelId}.truss.json`;
export const jobResultKey = (jobId: string) => `results/${jobId}.result.json`;
