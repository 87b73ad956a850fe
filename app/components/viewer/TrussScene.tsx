// The three.js scene of the viewer (client only: loaded lazily after mount). Members are one
// InstancedMesh of unit cylinders, so a 2,500-member truss is a single draw call; overlays
// (initial geometry, deformed shape) are line segments; supports are instanced cones and
// loads arrows. The camera frames the truss on demand ("fit"); planar trusses get a 2D
// projection (orthographic, pan and zoom only) unless the user asks for 3D.
import { AdaptiveDpr, OrbitControls, OrthographicCamera, PerspectiveCamera } from "@react-three/drei";
import { addAfterEffect, Canvas, useThree } from "@react-three/fiber";
import { useEffect, useLayoutEffect, useMemo, useRef } from "react";
import * as THREE from "three";
import type { OrbitControls as OrbitControlsImpl } from "three-stdlib";
import { markOnce, PAGE_MARKS } from "~/lib/page-timing";
import { cssColor, forceSense, SENSE_TOKENS } from "./palette";
import { isOverLimit, OVER_LIMIT_OUTLINE, utilizationColor } from "~/lib/utilization-scale";
import { litInstances, placeCone, placeCylinder } from "./instancing";
import { drawnBox, fitOrthographic, fitPerspective, jointRadius, loadArrows, reactionArrows, supportSize, type Box } from "./framing";
import { deformedPositions, upAxis, visualRadii, type TrussView, type Vec3 } from "./truss-view";

export type ColourMode = "utilization" | "force" | "plain";

export interface SceneSettings {
  colourMode: ColourMode;
  loadCase: number;
  showInitial: boolean;
  showDeformed: boolean;
  deformationScale: number;
  showLoads: boolean;
  showReactions?: boolean;
  showSupports: boolean;
  projection2d: boolean;
  fitNonce: number; // bump to re-frame the camera
}

/** Where the pointer rests over a member: its index and the pointer position inside the canvas (CSS pixels). */
export interface MemberHover {
  index: number;
  x: number;
  y: number;
}

export interface SceneProps {
  view: TrussView;
  settings: SceneSettings;
  /** colours by member id that replace the colour mode (the compare view's change in area) */
  paint?: Record<string, string> | null;
  /** the selected member, outlined */
  selected?: number | null;
  onSelectMember?: (index: number | null) => void;
  /** the selected node, ringed */
  selectedNode?: number | null;
  /** given: a click near a joint picks the node rather than the members meeting there */
  onSelectNode?: (index: number | null) => void;
  onHoverMember?: (hover: MemberHover | null) => void;
  onContextLost?: () => void;
  /** called once, after the first frame is rendered */
  onFirstFrame?: () => void;
}

export default function TrussScene({ view, settings, paint, selected, onSelectMember, selectedNode, onSelectNode, onHoverMember, onContextLost, onFirstFrame }: SceneProps) {
  const up = upAxis(view);
  const ortho = view.planar && settings.projection2d;
  const span = view.bounds.span;
  // big trusses: no multisampling and one pixel per CSS pixel, so orbiting stays fluid on
  // software renderers and small GPUs; thin members hardly show aliasing at that density
  const heavy = view.members.length > 1200;
  const { loadCase, showLoads, showReactions, showSupports, showDeformed, deformationScale } = settings;
  // once per change of what is drawn, not on every render of the page around the scene
  const box = useMemo(
    () => drawnBox(view, { loadCase, showLoads, showReactions, showSupports, showDeformed, deformationScale }),
    [view, loadCase, showLoads, showReactions, showSupports, showDeformed, deformationScale],
  );
  return (
    // one canvas for both projections: the cameras swap inside it (makeDefault). Re-keying
    // the canvas destroyed its WebGL context, which read as a lost context (issue 16).
    <Canvas
      frameloop="demand"
      // while the view moves, draw at a lower resolution (full again ~0.2 s after it stops)
      performance={{ min: heavy ? 0.4 : 0.6 }}
      dpr={heavy ? 1 : [1, 2]}
      gl={{ antialias: !heavy, preserveDrawingBuffer: true, powerPreference: "high-performance" }}
      onCreated={({ gl }) => {
        markOnce(PAGE_MARKS.canvasCreated);
        // reading each shader's compile log makes the first frame wait for every compile in
        // turn (a large share of it on software renderers); a production build skips that check
        gl.debug.checkShaderErrors = import.meta.env.DEV;
        gl.setClearColor(new THREE.Color(cssColor("--color-paper-raised", "#ffffff")));
        // a canvas React removes loses its context on purpose; only a context lost while the
        // canvas is still on the page is the browser reclaiming the GPU
        gl.domElement.addEventListener("webglcontextlost", () => {
          if (gl.domElement.isConnected) onContextLost?.();
        });
      }}
      data-testid="truss-canvas"
    >
      {ortho ? (
        <OrthographicCamera key="ortho" makeDefault near={-span * 10} far={span * 10} position={[0, 0, span]} up={[0, 1, 0]} />
      ) : (
        <PerspectiveCamera key="persp" makeDefault fov={40} near={span / 1000} far={span * 100} up={up === "z" ? [0, 0, 1] : [0, 1, 0]} />
      )}
      <AdaptiveDpr pixelated />
      <ambientLight intensity={0.85} />
      <directionalLight position={[1, 2, 3]} intensity={1.6} />
      <directionalLight position={[-2, -1, -1]} intensity={0.5} />
      <Members view={view} settings={settings} paint={paint ?? null} onSelect={onSelectMember} onSelectNode={onSelectNode} onHover={onHoverMember} />
      <Joints view={view} />
      {view.hasResult && !paint && settings.colourMode === "utilization" && <OverLimitOutlines view={view} />}
      {selected !== null && selected !== undefined && view.members[selected] && <SelectionOutline view={view} index={selected} />}
      {selectedNode !== null && selectedNode !== undefined && view.nodes[selectedNode] && <NodeMark view={view} index={selectedNode} />}
      {settings.showInitial && view.hasResult && <InitialOverlay view={view} />}
      {settings.showDeformed && view.hasResult && <DeformedOverlay view={view} settings={settings} />}
      {settings.showSupports && <Supports view={view} />}
      {settings.showLoads && <Loads view={view} loadCase={settings.loadCase} />}
      {settings.showReactions && <Loads view={view} loadCase={settings.loadCase} reactions />}
      <Framing view={view} box={box} ortho={ortho} up={up} fitNonce={settings.fitNonce} />
      <FirstFrameMark onDrawn={onFirstFrame} />
    </Canvas>
  );
}

/** Marks the page's timeline once the scene's first frame is rendered (after its draw calls). */
function FirstFrameMark({ onDrawn }: { onDrawn?: () => void }) {
  const gl = useThree((s) => s.gl);
  const latest = useRef(onDrawn);
  latest.current = onDrawn;
  useEffect(() => {
    const stop = addAfterEffect(() => {
      if (gl.info.render.frame === 0) return; // a tick of the loop that drew nothing yet
      stop();
      markOnce(PAGE_MARKS.firstFrame);
      latest.current?.();
    });
    return stop;
  }, [gl]);
  return null;
}

function memberColours(view: TrussView, settings: SceneSettings, paint: Record<string, string> | null): THREE.Color[] {
  const lc = view.loadCases[settings.loadCase];
  const plain = new THREE.Color(cssColor("--color-ink-soft", "#3b4757"));
  if (paint) return view.members.map((m) => (paint[m.id] ? new THREE.Color(paint[m.id]) : plain));
  if (!view.hasResult || settings.colourMode === "plain") return view.members.map(() => plain);
  if (settings.colourMode === "force") {
    const cache = Object.fromEntries(
      (Object.keys(SENSE_TOKENS) as (keyof typeof SENSE_TOKENS)[]).map((k) => [k, new THREE.Color(cssColor(SENSE_TOKENS[k].token))]),
    );
    return view.members.map((m) => cache[forceSense(m.force?.[lc?.id ?? ""] ?? 0, lc?.maxAbsForce ?? 0)]!);
  }
  return view.members.map((m) => (m.utilization === null ? plain : new THREE.Color(utilizationColor(m.utilization))));
}

function Members({
  view,
  settings,
  paint,
  onSelect,
  onSelectNode,
  onHover,
}: {
  view: TrussView;
  settings: SceneSettings;
  paint: Record<string, string> | null;
  onSelect?: (i: number | null) => void;
  onSelectNode?: (i: number | null) => void;
  onHover?: (h: MemberHover | null) => void;
}) {
  const invalidate = useThree((s) => s.invalidate);
  const mesh = useMemo(() => {
    // few radial segments: at 2,500 members the triangle count stays modest and members still read as round
    // the joints' spheres cover the member ends, so the cylinders need no caps
    return litInstances(new THREE.CylinderGeometry(1, 1, 1, view.members.length > 1200 ? 6 : 10, 1, true), view.members.length);
  }, [view]);

  useEffect(
    () => () => {
      mesh.geometry.dispose();
      (mesh.material as THREE.Material).dispose();
      mesh.dispose();
    },
    [mesh],
  );

  useLayoutEffect(() => {
    const radii = visualRadii(view);
    const mat = new THREE.Matrix4();
    view.members.forEach((m, i) => {
      placeCylinder(mat, view.nodes[m.a]!.position, view.nodes[m.b]!.position, radii[i]!);
      mesh.setMatrixAt(i, mat);
    });
    mesh.instanceMatrix.needsUpdate = true;
    mesh.computeBoundingSphere();
    invalidate();
  }, [mesh, view, invalidate]);

  const colourKey = `${settings.colourMode}:${settings.loadCase}`;
  useLayoutEffect(() => {
    memberColours(view, settings, paint).forEach((c, i) => mesh.setColorAt(i, c));
    if (mesh.instanceColor) mesh.instanceColor.needsUpdate = true;
    invalidate();
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [mesh, view, colourKey, paint, invalidate]);

  return (
    <>
      <primitive object={mesh} />
      {(onSelect || onHover) && <Picker view={view} mesh={mesh} onSelect={onSelect} onSelectNode={onSelectNode} onHover={onHover} />}
    </>
  );
}

/** A click this close to a joint's centre on screen picks the node (CSS pixels). */
const NODE_PICK_PX = 8;

/**
 * Click a member to select it (with onSelectNode, a click near a joint selects its node); rest
 * the pointer on a member to read it. The hover test runs at most once a frame and never while
 * a button is held (orbiting), so thousands of instances cost one raycast per drawn frame at
 * worst. Joints are picked on screen (the nearest within a few pixels), as they are drawn
 * barely wider than the members meeting there.
 */
function Picker({
  view,
  mesh,
  onSelect,
  onSelectNode,
  onHover,
}: {
  view: TrussView;
  mesh: THREE.InstancedMesh;
  onSelect?: (i: number | null) => void;
  onSelectNode?: (i: number | null) => void;
  onHover?: (h: MemberHover | null) => void;
}) {
  const gl = useThree((s) => s.gl);
  const camera = useThree((s) => s.camera);
  useEffect(() => {
    const el = gl.domElement;
    const ray = new THREE.Raycaster();
    let down: { x: number; y: number } | null = null;
    let frame = 0;
    let last: number | null = null;
    const hitAt = (e: PointerEvent) => {
      const r = el.getBoundingClientRect();
      ray.setFromCamera(new THREE.Vector2(((e.clientX - r.left) / r.width) * 2 - 1, -((e.clientY - r.top) / r.height) * 2 + 1), camera);
      return { id: ray.intersectObject(mesh, false)[0]?.instanceId ?? null, x: e.clientX - r.left, y: e.clientY - r.top };
    };
    const p = new THREE.Vector3();
    const nearestNode = (e: PointerEvent): number | null => {
      const r = el.getBoundingClientRect();
      const x = e.clientX - r.left;
      const y = e.clientY - r.top;
      let best: number | null = null;
      let bestD = NODE_PICK_PX;
      view.nodes.forEach((n, i) => {
        p.set(...n.position).project(camera);
        if (p.z < -1 || p.z > 1) return; // behind the camera or beyond its far plane
        const d = Math.hypot(((p.x + 1) / 2) * r.width - x, ((1 - p.y) / 2) * r.height - y);
        if (d <= bestD) {
          bestD = d;
          best = i;
        }
      });
      return best;
    };
    const onDown = (e: PointerEvent) => (down = { x: e.clientX, y: e.clientY });
    const onUp = (e: PointerEvent) => {
      if (!down || Math.hypot(e.clientX - down.x, e.clientY - down.y) > 4) return; // a drag, not a click
      const node = onSelectNode ? nearestNode(e) : null;
      if (node !== null) onSelectNode!(node);
      else onSelect?.(hitAt(e).id);
    };
    const onMove = (e: PointerEvent) => {
      if (!onHover || e.buttons !== 0 || frame) return;
      frame = requestAnimationFrame(() => {
        frame = 0;
        const h = hitAt(e);
        if (h.id === null && last === null) return;
        last = h.id;
        onHover(h.id === null ? null : { index: h.id, x: h.x, y: h.y });
      });
    };
    const onLeave = () => {
      last = null;
      onHover?.(null);
    };
    el.addEventListener("pointerdown", onDown);
    el.addEventListener("pointerup", onUp);
    el.addEventListener("pointermove", onMove);
    el.addEventListener("pointerleave", onLeave);
    return () => {
      cancelAnimationFrame(frame);
      el.removeEventListener("pointerdown", onDown);
      el.removeEventListener("pointerup", onUp);
      el.removeEventListener("pointermove", onMove);
      el.removeEventListener("pointerleave", onLeave);
    };
  }, [gl, camera, mesh, view, onSelect, onSelectNode, onHover]);
  return null;
}

/** The selected member: a wide shell in the brass accent around it, drawn from its back faces. */
function SelectionOutline({ view, index }: { view: TrussView; index: number }) {
  const invalidate = useThree((s) => s.invalidate);
  const mesh = useMemo(() => {
    const m = new THREE.Mesh(new THREE.CylinderGeometry(1, 1, 1, 12, 1, true), new THREE.MeshBasicMaterial({ color: new THREE.Color(cssColor("--color-brass-strong", "#9c6314")), side: THREE.BackSide }));
    m.matrixAutoUpdate = false;
    return m;
  }, []);
  useEffect(() => () => { mesh.geometry.dispose(); (mesh.material as THREE.Material).dispose(); }, [mesh]);
  useLayoutEffect(() => {
    const m = view.members[index]!;
    const radii = visualRadii(view);
    placeCylinder(mesh.matrix, view.nodes[m.a]!.position, view.nodes[m.b]!.position, radii[index]! * 2.4 + view.medianLength * 0.006);
    mesh.matrixWorldNeedsUpdate = true;
    invalidate();
  }, [mesh, view, index, invalidate]);
  return <primitive object={mesh} raycast={() => null} />;
}

/** The selected node: a ball in the brass accent, twice a joint's size, around it. */
function NodeMark({ view, index }: { view: TrussView; index: number }) {
  const invalidate = useThree((s) => s.invalidate);
  const mesh = useMemo(() => {
    const m = new THREE.Mesh(new THREE.SphereGeometry(1, 16, 12), new THREE.MeshBasicMaterial({ color: new THREE.Color(cssColor("--color-brass-strong", "#9c6314")) }));
    m.matrixAutoUpdate = false;
    return m;
  }, []);
  useEffect(() => () => { mesh.geometry.dispose(); (mesh.material as THREE.Material).dispose(); }, [mesh]);
  useLayoutEffect(() => {
    const r = jointRadius(view) * 2;
    mesh.matrix.makeScale(r, r, r).setPosition(...view.nodes[index]!.position);
    mesh.matrixWorldNeedsUpdate = true;
    invalidate();
  }, [mesh, view, index, invalidate]);
  return <primitive object={mesh} raycast={() => null} />;
}

function Joints({ view }: { view: TrussView }) {
  const invalidate = useThree((s) => s.invalidate);
  const mesh = useMemo(() => {
    return litInstances(
      view.nodes.length > 400 ? new THREE.SphereGeometry(1, 6, 4) : new THREE.SphereGeometry(1, 10, 8),
      view.nodes.length,
      new THREE.Color(cssColor("--color-ink", "#16202c")),
    );
  }, [view]);
  useEffect(() => () => { mesh.geometry.dispose(); (mesh.material as THREE.Material).dispose(); mesh.dispose(); }, [mesh]);
  useLayoutEffect(() => {
    const r = jointRadius(view);
    const mat = new THREE.Matrix4();
    view.nodes.forEach((n, i) => {
      mat.makeScale(r, r, r).setPosition(...n.position);
      mesh.setMatrixAt(i, mat);
    });
    mesh.instanceMatrix.needsUpdate = true;
    mesh.computeBoundingSphere();
    invalidate();
  }, [mesh, view, invalidate]);
  return <primitive object={mesh} raycast={() => null} />;
}

function segmentsGeometry(view: TrussView, positions: Vec3[]): THREE.BufferGeometry {
  const arr = new Float32Array(view.members.length * 6);
  view.members.forEach((m, i) => {
    arr.set(positions[m.a]!, i * 6);
    arr.set(positions[m.b]!, i * 6 + 3);
  });
  const g = new THREE.BufferGeometry();
  g.setAttribute("position", new THREE.BufferAttribute(arr, 3));
  return g;
}

/**
 * Members over their limit get an outline of their own: a wider shell drawn from its back
 * faces in the "bad" colour around the member, so the mark does not depend on telling hues apart.
 */
function OverLimitOutlines({ view }: { view: TrussView }) {
  const invalidate = useThree((s) => s.invalidate);
  const over = useMemo(() => view.members.map((m, i) => (m.utilization !== null && isOverLimit(m.utilization) ? i : -1)).filter((i) => i >= 0), [view]);
  const mesh = useMemo(() => {
    const geometry = new THREE.CylinderGeometry(1, 1, 1, 10, 1, true);
    const material = new THREE.MeshBasicMaterial({ color: new THREE.Color(OVER_LIMIT_OUTLINE), side: THREE.BackSide });
    const m = new THREE.InstancedMesh(geometry, material, Math.max(1, over.length));
    m.count = over.length;
    return m;
  }, [over]);
  useEffect(() => () => { mesh.geometry.dispose(); (mesh.material as THREE.Material).dispose(); mesh.dispose(); }, [mesh]);
  useLayoutEffect(() => {
    const radii = visualRadii(view);
    const mat = new THREE.Matrix4();
    over.forEach((i, k) => {
      const m = view.members[i]!;
      placeCylinder(mat, view.nodes[m.a]!.position, view.nodes[m.b]!.position, radii[i]! * 1.8 + view.medianLength * 0.004);
      mesh.setMatrixAt(k, mat);
    });
    mesh.instanceMatrix.needsUpdate = true;
    mesh.computeBoundingSphere();
    invalidate();
  }, [mesh, over, view, invalidate]);
  if (over.length === 0) return null;
  return <primitive object={mesh} raycast={() => null} />;
}

function InitialOverlay({ view }: { view: TrussView }) {
  const obj = useMemo(() => {
    const g = segmentsGeometry(view, view.nodes.map((n) => n.initial));
    const line = new THREE.LineSegments(
      g,
      new THREE.LineDashedMaterial({ color: new THREE.Color(cssColor("--color-ink-muted")), dashSize: view.medianLength * 0.06, gapSize: view.medianLength * 0.04, transparent: true, opacity: 0.8 }),
    );
    line.computeLineDistances();
    return line;
  }, [view]);
  useEffect(() => () => { obj.geometry.dispose(); (obj.material as THREE.Material).dispose(); }, [obj]);
  return <primitive object={obj} raycast={() => null} />;
}

function DeformedOverlay({ view, settings }: { view: TrussView; settings: SceneSettings }) {
  const invalidate = useThree((s) => s.invalidate);
  const obj = useMemo(
    () => new THREE.LineSegments(segmentsGeometry(view, deformedPositions(view, settings.loadCase, settings.deformationScale)), new THREE.LineBasicMaterial({ color: new THREE.Color(cssColor("--color-brass-strong", "#9c6314")) })),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [view],
  );
  useEffect(() => () => { obj.geometry.dispose(); (obj.material as THREE.Material).dispose(); }, [obj]);
  useLayoutEffect(() => {
    const pos = deformedPositions(view, settings.loadCase, settings.deformationScale);
    const attr = obj.geometry.getAttribute("position") as THREE.BufferAttribute;
    view.members.forEach((m, i) => {
      attr.setXYZ(i * 2, ...pos[m.a]!);
      attr.setXYZ(i * 2 + 1, ...pos[m.b]!);
    });
    attr.needsUpdate = true;
    obj.geometry.computeBoundingSphere();
    invalidate();
  }, [obj, view, settings.loadCase, settings.deformationScale, invalidate]);
  return <primitive object={obj} raycast={() => null} />;
}

const AXIS_VECTORS: Record<string, THREE.Vector3> = {
  x: new THREE.Vector3(1, 0, 0),
  y: new THREE.Vector3(0, 1, 0),
  z: new THREE.Vector3(0, 0, 1),
};

/** One small cone per restrained axis, its tip on the node, pointing along that axis. */
function Supports({ view }: { view: TrussView }) {
  const invalidate = useThree((s) => s.invalidate);
  const items = useMemo(() => view.nodes.flatMap((n) => n.fixed.map((axis) => ({ node: n, axis }))), [view]);
  const mesh = useMemo(() => {
    const geo = new THREE.ConeGeometry(0.5, 1, 12);
    geo.translate(0, -0.5, 0); // tip at the origin, body below it
    return litInstances(geo, items.length, new THREE.Color(cssColor("--color-ok", "#2f7d5b")));
  }, [items]);
  useEffect(() => () => { mesh.geometry.dispose(); (mesh.material as THREE.Material).dispose(); mesh.dispose(); }, [mesh]);
  useLayoutEffect(() => {
    const size = supportSize(view);
    const mat = new THREE.Matrix4();
    items.forEach((it, i) => {
      mesh.setMatrixAt(i, placeCone(mat, it.node.position, AXIS_VECTORS[it.axis]!, size));
    });
    mesh.instanceMatrix.needsUpdate = true;
    mesh.computeBoundingSphere();
    invalidate();
  }, [mesh, items, view, invalidate]);
  return <primitive object={mesh} raycast={() => null} />;
}

/**
 * Load arrows of one load case (or, with `reactions`, its support reactions, in the supports'
 * green), heads on the node, length by magnitude: all shafts in one instanced mesh of thin
 * cylinders and all heads in one of cones, in the scene's one lit material (two draw calls for
 * any number of arrows, no shader program of their own).
 */
function Loads({ view, loadCase, reactions = false }: { view: TrussView; loadCase: number; reactions?: boolean }) {
  const invalidate = useThree((s) => s.invalidate);
  const arrows = useMemo(
    () => (reactions ? reactionArrows : loadArrows)(view, loadCase).map((a) => ({ ...a, dir: new THREE.Vector3(...a.dir) })),
    [view, loadCase, reactions],
  );
  const objects = useMemo(() => {
    // loads in ink, not blue (tension members are); reactions in the supports' colour
    const colour = new THREE.Color(reactions ? cssColor("--color-ok", "#2f7d5b") : cssColor("--color-ink", "#16202c"));
    const shafts = litInstances(new THREE.CylinderGeometry(1, 1, 1, 6, 1, true), arrows.length, colour);
    const cone = new THREE.ConeGeometry(0.5, 1, 10);
    cone.translate(0, -0.5, 0);
    const heads = litInstances(cone, arrows.length, colour);
    return { shafts, heads };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [arrows]);
  useLayoutEffect(() => {
    const mat = new THREE.Matrix4();
    const s = new THREE.Vector3();
    const q = new THREE.Quaternion();
    arrows.forEach((a, i) => {
      // a head a quarter of the arrow long, half as wide as long; tip at the node
      q.setFromUnitVectors(new THREE.Vector3(0, 1, 0), a.dir);
      s.set(a.len * 0.14, a.len * 0.28, a.len * 0.14);
      mat.compose(new THREE.Vector3(...a.tip), q, s);
      objects.heads.setMatrixAt(i, mat);
      // the shaft from the arrow's tail to the head's base, a fifth of the head's width
      const tip: Vec3 = [a.tip[0], a.tip[1], a.tip[2]];
      const tail: Vec3 = [tip[0] - a.dir.x * a.len, tip[1] - a.dir.y * a.len, tip[2] - a.dir.z * a.len];
      const neck: Vec3 = [tip[0] - a.dir.x * a.len * 0.28, tip[1] - a.dir.y * a.len * 0.28, tip[2] - a.dir.z * a.len * 0.28];
      objects.shafts.setMatrixAt(i, placeCylinder(mat, tail, neck, a.len * 0.028));
    });
    for (const m of [objects.heads, objects.shafts]) {
      m.instanceMatrix.needsUpdate = true;
      m.computeBoundingSphere();
    }
    invalidate();
  }, [arrows, objects, invalidate]);
  useEffect(
    () => () => {
      for (const o of [objects.shafts, objects.heads]) {
        o.geometry.dispose();
        (o.material as THREE.Material).dispose();
        o.dispose();
      }
    },
    [objects],
  );
  return (
    <>
      <primitive object={objects.shafts} raycast={() => null} />
      <primitive object={objects.heads} raycast={() => null} />
    </>
  );
}

/** Frames the truss: on mount, on "fit" and when the view changes. */
function Framing({ view, box, ortho, up, fitNonce }: { view: TrussView; box: Box; ortho: boolean; up: "y" | "z"; fitNonce: number }) {
  const camera = useThree((s) => s.camera);
  // the box follows the toggles (loads, supports, deformed shape), but only a fit request, a
  // new truss or a resized canvas moves the camera: a toggle must not make the view jump
  const latestBox = useRef(box);
  latestBox.current = box;
  const size = useThree((s) => s.size);
  const invalidate = useThree((s) => s.invalidate);
  const gl = useThree((s) => s.gl);
  const controls = useRef<OrbitControlsImpl>(null);

  // keyboard: the canvas takes focus; arrow keys pan (OrbitControls), F frames the truss (viewer)
  useEffect(() => {
    const el = gl.domElement;
    el.tabIndex = 0;
    el.setAttribute("aria-label", "3D view of the truss. Arrow keys pan, F fits the truss to the view.");
    controls.current?.listenToKeyEvents(el);
    return () => controls.current?.stopListenToKeyEvents?.();
  }, [gl]);

  useLayoutEffect(() => {
    const drawn = latestBox.current;
    let target: THREE.Vector3;
    if (ortho && camera instanceof THREE.OrthographicCamera) {
      const fit = fitOrthographic(drawn, { width: size.width, height: size.height });
      target = new THREE.Vector3(...fit.target);
      camera.position.set(fit.target[0], fit.target[1], fit.target[2] + view.bounds.span);
      camera.zoom = fit.zoom;
    } else if (camera instanceof THREE.PerspectiveCamera) {
      // a three-quarter view from the front, slightly above, as near as the margin allows;
      // the aspect is the canvas's own (the camera's may not have caught up with a resize yet)
      const back: Vec3 = up === "z" ? [0.9, -1.6, 0.8] : [0.9, 0.7, 1.6];
      const fit = fitPerspective(drawn, { fovDeg: camera.fov, aspect: size.width / Math.max(1, size.height), back, up: up === "z" ? [0, 0, 1] : [0, 1, 0] });
      target = new THREE.Vector3(...fit.target);
      camera.aspect = size.width / Math.max(1, size.height);
      camera.position.set(...fit.position);
    } else {
      target = new THREE.Vector3(...view.bounds.center);
    }
    camera.lookAt(target);
    camera.updateProjectionMatrix();
    if (controls.current) {
      controls.current.target.copy(target);
      controls.current.update();
    }
    invalidate();
    // re-frame on request, for a new truss, and when the box changes size (a phone turned,
    // a window resized): the fit depends on the aspect ratio
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [view, ortho, up, fitNonce, camera, Math.round(size.width / 40), Math.round(size.height / 40)]);

  return (
    <OrbitControls
      ref={controls}
      makeDefault
      enableRotate={!ortho}
      enableDamping={false}
      regress
      screenSpacePanning
      target={view.bounds.center}
    />
  );
}
