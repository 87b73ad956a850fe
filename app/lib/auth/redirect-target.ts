// Where to go after signing in: only a path on this site, never another origin.
export function safeRedirect(to: FormDataEntryValue | string | null | undefined, fallback = "/projects"): string {
  if (typeof to !== "string" || !to.startsWith("/") || to.startsWith("//") || to.startsWith("/\\")) return fallback;
  if (to.startsWith("/sign-in") || to.startsWith("/sign-out")) return fallback;
  return to;
}
