// The 3D view of a truss with its controls and legend. The canvas is created only in a
// browser that offers WebGL (three.js cannot render on the server), after hydration on a page
// the server rendered; until then, and without WebGL, the box says what is happening instead
// of staying blank.
import { Component, lazy, Suspense, useCallback, useEffect, useMemo, useState, useSyncExternalStore, type ComponentType, type ReactNode } from "react";
import { formatNumber, formatPercent, quantityFormatter, type DisplayUnitChoice, type QuantityFormatter } from "~/lib/format";
import { Legend } from "./Legend";
import type { ColourMode, MemberHover, SceneProps, SceneSettings } from "./TrussScene";
import { buildTrussView, defaultDeformationScale, type ModelLike, type ResultLike, type TrussView } from "./truss-view";

type SceneComponent = ComponentType<SceneProps>;
/** The scene's module once loaded: a viewer mounted after that uses it directly, without suspending for a render. */
let loadedScene: SceneComponent | null = null;
const loadScene = () =>
  import("./TrussScene").then((m) => {
    loadedScene = m.default;
    return m;
  });
// In the browser, fetch the three.js chunk while the page hydrates rather than after mount
if (typeof window !== "undefined") void loadScene();
const LazyScene = lazy(loadScene);

let webglProbed: boolean | null = null;
/** WebGL available, probed once per page (each probe costs a context). */
const webglOnce = () => (webglProbed ??= webglAvailable());
const noSubscription = () => () => {};

export function webglAvailable(): boolean {
  try {
    const c = document.createElement("canvas");
    const ctx = c.getContext("webgl2") || c.getContext("webgl");
    // give the probe's context back at once: browsers keep only a few alive per page
    ctx?.getExtension("WEBGL_lose_context")?.loseContext();
    return !!ctx;
  } catch {
    return false;
  }
}

class SceneBoundary extends Component<{ fallback: ReactNode; children: ReactNode }, { failed: boolean }> {
  state = { failed: false };
  static getDerivedStateFromError() {
    return { failed: true };
  }
  render() {
    return this.state.failed ? this.props.fallback : this.props.children;
  }
}

interface Props {
  model: ModelLike;
  result?: ResultLike | null;
  title?: string;
  height?: string;
  /** the page's chosen load case or combination; without it the viewer offers its own choice */
  caseId?: string;
  /** a controlled selection (the editor ties it to its member table) */
  selectedMember?: number | null;
  onSelectMember?: (index: number | null) => void;
  /** a controlled node selection (the editor ties it to its node table); given, clicks near a joint pick nodes */
  selectedNode?: number | null;
  onSelectNode?: (index: number | null) => void;
  /** the same, by member id (the job page ties it to its member table) */
  selectedMemberId?: string | null;
  onSelectMemberId?: (id: string | null) => void;
  /** the reader's display units for the figures it writes (account page) */
  displayUnits?: DisplayUnitChoice;
  /** colours by member id in place of the colour modes, with their own legend and hover words */
  paint?: { colours: Record<string, string>; legend: ReactNode; describe: (memberId: string) => string } | null;
  /** called once the first frame is drawn (or at once when this browser cannot draw one) */
  onFirstFrame?: () => void;
}

const SCALE_STEPS = 40; // slider positions, on a log scale around the default magnification

export function TrussViewer({ model, result, title = "3D view", height = "h-[26rem] sm:h-[32rem]", caseId, selectedMember, onSelectMember, selectedNode = null, onSelectNode, selectedMemberId, onSelectMemberId, displayUnits = "model", paint, onFirstFrame }: Props) {
  const view = useMemo(() => buildTrussView(model, result), [model, result]);
  const q = useMemo(() => (view.units ? quantityFormatter(view.units, displayUnits) : null), [view.units, displayUnits]);
  const byId = useMemo(() => new Map(view.members.map((m, i) => [m.id, i])), [view]);
  if (selectedMemberId !== undefined) selectedMember = selectedMemberId === null ? null : (byId.get(selectedMemberId) ?? null);
  const hasReactions = view.loadCases.some((c) => c.reactions.length > 0);
  // null on the server and while hydrating (the server's answer); a viewer first rendered in
  // the browser (the editor's, once its model has arrived) knows at once, without an effect
  // and a second render before its canvas can be made
  const gl = useSyncExternalStore(noSubscription, webglOnce, () => null);
  // chosen once: a component of another type on a later render would remount the canvas
  const [Scene] = useState<SceneComponent>(() => loadedScene ?? LazyScene);
  const [lost, setLost] = useState(false);
  const [ownSelected, setOwnSelected] = useState<number | null>(null);
  const selected = selectedMember !== undefined ? selectedMember : ownSelected;
  const setSelected = useMemo(
    () => (onSelectMemberId ? (i: number | null) => onSelectMemberId(i === null ? null : (view.members[i]?.id ?? null)) : (onSelectMember ?? setOwnSelected)),
    [onSelectMemberId, onSelectMember, view],
  );
  const [hover, setHover] = useState<MemberHover | null>(null);
  const onHover = useCallback((h: MemberHover | null) => setHover(h), []);
  const [ownCase, setLoadCase] = useState(0);
  const pickedIndex = caseId === undefined ? -1 : view.loadCases.findIndex((c) => c.id === caseId);
  const loadCase = pickedIndex >= 0 ? pickedIndex : ownCase;
  const baseScale = useMemo(() => defaultDeformationScale(view, loadCase), [view, loadCase]);
  const [scaleStep, setScaleStep] = useState(SCALE_STEPS / 2);
  const [settings, setSettings] = useState<Omit<SceneSettings, "loadCase" | "deformationScale">>({
    colourMode: view.hasResult ? "utilization" : "plain",
    showInitial: view.hasResult,
    showDeformed: false,
    showLoads: true,
    showReactions: hasReactions,
    showSupports: true,
    projection2d: view.planar,
    fitNonce: 0,
  });

  // nothing will be drawn without WebGL or after a lost context: whoever waits goes on now
  useEffect(() => {
    if (gl === false || lost) onFirstFrame?.();
  }, [gl, lost, onFirstFrame]);

  // slider position → magnification: centre = default, ends = default / 10 and × 10
  const deformationScale = baseScale * Math.pow(10, (scaleStep - SCALE_STEPS / 2) / (SCALE_STEPS / 2));
  const set = <K extends keyof typeof settings>(k: K, v: (typeof settings)[K]) => setSettings((s) => ({ ...s, [k]: v }));
  const lc = view.loadCases[loadCase];
  const sel = selected !== null ? view.members[selected] : undefined;
  const selNode = selectedNode !== null ? view.nodes[selectedNode] : undefined;
  const units = view.units;

  const fallback = (
    <div className="flex h-full items-center justify-center p-6 text-center text-sm text-ink-muted" role="status">
      {lost
        ? "The graphics context was lost (the browser reclaimed the GPU). Reload the page to draw the truss again; the tables and downloads hold every value."
        : "This browser cannot draw 3D graphics here (WebGL is off or unavailable). Every figure on this page is also in its tables and downloads."}
    </div>
  );

  return (
    <section className="card p-0" aria-label={title} data-testid="truss-viewer">
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2 border-b border-rule px-4 py-3 text-sm">
        <h2 className="mr-auto font-semibold">{title}</h2>
        {view.hasResult && !paint && (
          <label className="flex items-center gap-2">
            <span className="text-ink-muted">Colour</span>
            <select
              className="field-input w-auto py-1"
              value={settings.colourMode}
              onChange={(e) => set("colourMode", e.target.value as ColourMode)}
            >
              <option value="utilization">utilization</option>
              <option value="force">tension / compression</option>
              <option value="plain">plain</option>
            </select>
          </label>
        )}
        {/* a painted view (the compare page's change in area) has no load case or deformed shape to show */}
        {view.loadCases.length > 1 && caseId === undefined && !paint && (
          <label className="flex min-w-0 max-w-full items-center gap-2">
            <span className="whitespace-nowrap text-ink-muted">Load case</span>
            <select className="field-input w-auto min-w-0 max-w-full py-1" value={loadCase} onChange={(e) => setLoadCase(Number(e.target.value))}>
              {view.loadCases.map((c, i) => (
                <option key={c.id} value={i}>
                  {c.name ? `${c.id} — ${c.name}` : c.id}
                  {c.combination ? " (combination)" : ""}
                </option>
              ))}
            </select>
          </label>
        )}
        {view.planar && (
          <button type="button" className="btn btn-secondary px-3 py-1" onClick={() => set("projection2d", !settings.projection2d)} aria-pressed={!settings.projection2d}>
            {settings.projection2d ? "Orbit in 3D" : "Flat 2D view"}
          </button>
        )}
        <button type="button" className="btn btn-secondary px-3 py-1" onClick={() => set("fitNonce", settings.fitNonce + 1)}>
          Fit to view
        </button>
      </div>

      <div className="flex flex-wrap gap-x-5 gap-y-2 border-b border-rule px-4 py-2 text-sm">
        {view.hasResult && (
          <Toggle label={view.shapeChanged ? "initial geometry" : "initial outline"} checked={settings.showInitial} onChange={(v) => set("showInitial", v)} />
        )}
        {view.hasResult && !paint && <Toggle label="deformed shape" checked={settings.showDeformed} onChange={(v) => set("showDeformed", v)} />}
        <Toggle label="loads" checked={settings.showLoads} onChange={(v) => set("showLoads", v)} />
        <Toggle label="supports" checked={settings.showSupports} onChange={(v) => set("showSupports", v)} />
        {hasReactions && <Toggle label="reactions" checked={!!settings.showReactions} onChange={(v) => set("showReactions", v)} />}
        {view.hasResult && settings.showDeformed && !paint && (
          <label className="flex min-w-56 flex-1 items-center gap-2">
            <span className="whitespace-nowrap text-ink-muted">Magnify ×{formatNumber(deformationScale, { sig: 2 })}</span>
            <input
              type="range"
              min={0}
              max={SCALE_STEPS}
              step={1}
              value={scaleStep}
              onChange={(e) => setScaleStep(Number(e.target.value))}
              className="w-full accent-[var(--color-brass)]"
              aria-label="Deformation magnification"
              aria-valuetext={`${formatNumber(deformationScale, { sig: 2 })} times`}
            />
          </label>
        )}
      </div>

      <div
        className={`relative ${height} bg-paper-raised`}
        onKeyDown={(e) => {
          if ((e.key === "f" || e.key === "F") && !e.ctrlKey && !e.metaKey && !e.altKey) set("fitNonce", settings.fitNonce + 1);
        }}
      >
        {gl === null ? (
          <div className="flex h-full items-center justify-center text-sm text-ink-muted" role="status">
            Preparing the 3D view…
          </div>
        ) : !gl || lost ? (
          fallback
        ) : (
          <SceneBoundary fallback={fallback}>
            <Suspense
              fallback={
                <div className="flex h-full items-center justify-center text-sm text-ink-muted" role="status">
                  Loading the 3D view…
                </div>
              }
            >
              <Scene
                view={view}
                settings={{ ...settings, loadCase, deformationScale }}
                paint={paint?.colours ?? null}
                selected={selected}
                onSelectMember={setSelected}
                selectedNode={selectedNode}
                onSelectNode={onSelectNode}
                onHoverMember={onHover}
                onContextLost={() => setLost(true)}
                onFirstFrame={onFirstFrame}
              />
            </Suspense>
          </SceneBoundary>
        )}
        {hover && view.members[hover.index] && (
          <p
            className="pointer-events-none absolute z-10 max-w-[18rem] rounded-md border border-rule bg-paper-raised px-2 py-1 text-xs shadow-sm"
            style={{ left: Math.max(4, hover.x + 12), top: Math.max(4, hover.y + 12) }}
            role="status"
            data-testid="member-hover"
          >
            {paint ? paint.describe(view.members[hover.index]!.id) : memberWords(view.members[hover.index]!, lc?.id, q)}
          </p>
        )}
        <p className="pointer-events-none absolute bottom-2 left-3 text-2xs text-ink-muted">
          {view.planar && settings.projection2d ? "drag or arrow keys to pan · wheel to zoom · F to fit" : "drag to orbit · right-drag or arrow keys to pan · wheel to zoom · F to fit"}
        </p>
      </div>

      <div className="flex flex-col gap-3 border-t border-rule px-4 py-3 text-sm sm:flex-row sm:items-start sm:justify-between">
        {paint ? (
          paint.legend
        ) : (
          <Legend
            mode={view.hasResult ? settings.colourMode : "plain"}
            showInitial={settings.showInitial && view.hasResult}
            showDeformed={settings.showDeformed && view.hasResult}
            showReactions={!!settings.showReactions && hasReactions}
          />
        )}
        <p className="text-ink-muted sm:text-right" aria-live="polite" data-testid="selected-member">
          {selNode ? (
            <>
              Node <strong className="text-ink">{selNode.id}</strong> at ({selNode.position.map((v) => formatNumber(v)).join(", ")}){units ? ` ${units.length}` : ""}
              {selNode.fixed.length > 0 ? `, restrained in ${selNode.fixed.join(", ")}` : ", free"}
            </>
          ) : sel ? (
            <>
              Member <strong className="text-ink">{sel.id}</strong> ({view.nodes[sel.a]!.id}–{view.nodes[sel.b]!.id}): {paint ? paint.describe(sel.id) : memberWords(sel, lc?.id, q)}
            </>
          ) : (
            `${view.members.length} members, ${view.nodes.length} nodes${view.planar ? ", planar" : ""}. Click a member${onSelectNode ? " or a node" : ""} for its values.`
          )}
        </p>
      </div>
    </section>
  );
}

/** "area 1,234 mm², force −56.78 kN in LC1, utilization 95.3 %" */
function memberWords(m: TrussView["members"][number], caseId: string | undefined, q: QuantityFormatter | null): string {
  const parts = [`area ${q ? q.text(m.area, "area") : formatNumber(m.area)}`];
  if (m.force && caseId) parts.push(`force ${q ? q.text(m.force[caseId] ?? 0, "force") : formatNumber(m.force[caseId] ?? 0)} in ${caseId}`);
  if (m.utilization !== null) parts.push(`utilization ${formatPercent(m.utilization)}`);
  return parts.join(", ");
}

function Toggle({ label, checked, onChange }: { label: string; checked: boolean; onChange: (v: boolean) => void }) {
  return (
    <label className="flex cursor-pointer items-center gap-1.5">
      <input type="checkbox" className="h-4 w-4 accent-[var(--color-brass)]" checked={checked} onChange={(e) => onChange(e.target.checked)} />
      {label}
    </label>
  );
}
