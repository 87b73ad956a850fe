// The job page's 3D view, following the page-wide load case or combination (ResultCase.tsx).
import type { ComponentProps } from "react";
import { TrussViewer } from "~/components/viewer/TrussViewer";
import { useSharedCase } from "./ResultCase";

export function ResultTrussViewer(props: Omit<ComponentProps<typeof TrussViewer>, "caseId">) {
  const shared = useSharedCase();
  return <TrussViewer {...props} caseId={shared?.current} />;
}
