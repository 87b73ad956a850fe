// Object keys in the bucket. A result is keyed by its job alone, so a job that ran twice
// (a worker died after writing, before recording) overwrites the same object: stored once.
export const modelFileKey = (modelId: string) => `models/${modelId}.truss.json`;
export const jobResultKey = (jobId: string) => `results/${jobId}.result.json`;
// version 1 keeps the upload's key (modelFileKey); later versions sit beside it
export const modelVersionFileKey = (modelId: string, version: number) => (version === 1 ? modelFileKey(modelId) : `models/${modelId}/v${version}.truss.json`);
