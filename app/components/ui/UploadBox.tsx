// Drop or pick a truss JSON. The file goes to the page's action as multipart form data;
// validation problems come back listed, each with the item it names.
import { useCallback } from "react";
import { useDropzone, type FileRejection } from "react-dropzone";
import { useFetcher } from "react-router";
import { formatBytes } from "~/lib/format";
import { ErrorNote, IssueList, type Issue } from "./States";

export interface UploadResult {
  error?: string;
  details?: Issue[];
  warnings?: Issue[];
}

/** `fields` travel with the file (e.g. the catalogue whose sections the model takes). */
export function UploadBox({ projectId, limitBytes, fields }: { projectId: string; limitBytes: number; fields?: Record<string, string> }) {
  const fetcher = useFetcher<UploadResult>();
  const busy = fetcher.state !== "idle";

  const onDrop = useCallback(
    (accepted: File[]) => {
      const file = accepted[0];
      if (!file) return;
      const fd = new FormData();
      fd.set("intent", "upload");
      fd.set("projectId", projectId);
      fd.set("file", file, file.name);
      for (const [k, v] of Object.entries(fields ?? {})) if (v) fd.set(k, v);
      fetcher.submit(fd, { method: "post", encType: "multipart/form-data" });
    },
    [fetcher, projectId, fields],
  );

  const { getRootProps, getInputProps, isDragActive, fileRejections } = useDropzone({
    onDrop,
    multiple: false,
    maxSize: limitBytes,
    accept: { "application/json": [".json"] },
    disabled: busy,
  });

  const rejection: FileRejection | undefined = fileRejections[0];
  const rejectText = rejection
    ? rejection.errors
        .map((e) =>
          e.code === "file-too-large"
            ? `${rejection.file.name} is ${formatBytes(rejection.file.size)}; the limit is ${formatBytes(limitBytes)}`
            : e.code === "file-invalid-type"
              ? `${rejection.file.name} is not a .json file`
              : e.message,
        )
        .join("; ")
    : null;

  return (
    <div className="space-y-3" data-testid="upload">
      <div
        {...getRootProps({
          className: `flex cursor-pointer flex-col items-center justify-center rounded-[var(--radius-card)] border-2 border-dashed px-6 py-8 text-center transition-colors ${
            isDragActive ? "border-brass bg-brass-wash" : "border-rule bg-paper hover:border-brass/60"
          } ${busy ? "opacity-60" : ""}`,
          "aria-label": "Upload a truss model: drop a JSON file here or press Enter to pick one",
        })}
      >
        <input {...getInputProps({ name: "file", "aria-label": "Truss model file" })} />
        <p className="font-medium text-ink">{busy ? "Checking the model…" : isDragActive ? "Drop the file to upload it" : "Drop a truss JSON here, or click to pick one"}</p>
        <p className="mt-1 text-xs text-ink-muted">
          format strutwise.truss version 1 · up to {formatBytes(limitBytes)} · checked at once, nothing is stored if it has errors
        </p>
      </div>
      {rejectText && <ErrorNote title="That file was not sent">{rejectText}</ErrorNote>}
      {fetcher.data?.error && !busy && (
        <>
          {fetcher.data.details?.length ? (
            <IssueList title="Nothing was stored: fix these problems and upload the file again" issues={fetcher.data.details} />
          ) : (
            <ErrorNote title="The model was not stored">{fetcher.data.error}</ErrorNote>
          )}
        </>
      )}
    </div>
  );
}
