// User-timing marks of the steps to a page's first drawn picture (the workbench bench reads
// them with the navigation entry to split its figure into phases). Kept in production builds:
// a mark is a few microseconds, set once per page, and changes nothing on the page.

/** The marks the editor page sets on its way to the preview's first frame, in order. */
export const PAGE_MARKS = {
  /** the page's first effect ran: it is hydrated (the model's file may still be on its way) */
  pageHydrated: "page-hydrated",
  /** the editor's first effect ran: the model is parsed, its tables and preview are built */
  editorMounted: "editor-mounted",
  /** the preview's WebGL canvas and renderer exist */
  canvasCreated: "truss-canvas-created",
  /** the preview's first frame has been rendered (after the draw calls, not before) */
  firstFrame: "truss-first-frame",
} as const;

/** Sets the user-timing mark `name` unless this page already has one (the first time counts). */
export function markOnce(name: string): void {
  if (typeof performance === "undefined" || typeof performance.mark !== "function") return;
  if (performance.getEntriesByName(name, "mark").length === 0) performance.mark(name);
}
