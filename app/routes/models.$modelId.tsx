import { unitLabel } from "~/engine/truss/units";
import type { Units } from "~/engine/truss/schema";
import { eq } from "drizzle-orm";
import { data, Link, redirect } from "react-router";
import { toJobRows } from "~/components/job/job-rows.server";
import { JobsList } from "~/components/job/JobsList";
import { parseQueueForm } from "~/components/job/queue-form";
import { QueueForm, type QueueDefaults } from "~/components/job/QueueForm";
import { formatBytes, formatDateTime, formatNumber } from "~/lib/format";
import { RouteError } from "~/components/ui/RouteError";
import { EmptyState, IssueList, Stat } from "~/components/ui/States";
import { TrussViewer } from "~/components/viewer/TrussViewer";
import type { ModelLike } from "~/components/viewer/truss-view";
import { db } from "~/db/client.server";
import { projects, user as users } from "~/db/schema";
import { audit } from "~/lib/auth/audit.server";
import { requireModel } from "~/lib/access.server";
import { can } from "~/lib/auth/permissions";
import { notFound, withDependencies } from "~/lib/http.server";
import { enqueueJob, listJobs } from "~/lib/jobs/queue.server";
import { getModel, getModelFile } from "~/lib/models.server";
import { ModelVersions } from "~/components/editor/ModelVersions";
import { listModelVersions } from "~/lib/models/versions.server";
import type { Route } from "./+types/models.$modelId";
import { plainText } from "~/lib/text-hygiene";
import { minOf } from "~/engine/util/extent";
import { formulationWords } from "~/components/job/result-words";

export function meta({ data }: Route.MetaArgs) {
  return [{ title: data ? `${plainText(data.model.name)} — Strutwise` : "Model — Strutwise" }];
}

interface ModelFile extends ModelLike {
  name: string;
  description?: string;
  units: { length: string; force: string; mass: string };
  materials: { id: string; name?: string; E: number; density: number; allowableTension?: number; allowableCompression?: number }[];
  design?: {
    objective?: string;
    formulation?: string;
    areaBounds?: { min: number; max: number };
    groups?: { id: string }[];
    shape?: { id: string; min: number; max: number }[];
    constraints?: { stress?: boolean; displacement?: { node: string; axis: string; limit: number }[]; volume?: { max: number }; buckling?: object };
    solver?: { maxIterations?: number; tolerance?: number };
  };
}

// ModelSummary of the engine (docs/engine-api.md), read defensively: stored rows keep the
// summary of the engine version that validated them.
interface SummaryLike {
  counts?: Record<string, number>;
  totalLength?: number;
  initialVolume?: number;
  initialMass?: number;
  stability?: { ok: boolean; message: string; node?: string; axis?: string };
}

export const loader = withDependencies(async function loader({ request, params }: Route.LoaderArgs) {
  const { user } = await requireModel(request, params.modelId, "read:model");
  const model = await getModel(params.modelId);
  if (!model) notFound(`Model ${params.modelId}`);
  const [[project], [uploader], file, jobs] = await Promise.all([
    db().select({ id: projects.id, code: projects.code, name: projects.name }).from(projects).where(eq(projects.id, model.projectId)).limit(1),
    model.uploadedBy ? db().select({ name: users.name }).from(users).where(eq(users.id, model.uploadedBy)).limit(1) : Promise.resolve([]),
    getModelFile(model.id).catch(() => null),
    listJobs({ modelId: model.id, limit: 20 }),
  ]);
  const versions = (await listModelVersions(model.id)).map((v) => ({ version: v.version, note: v.note, createdAt: v.createdAt, hasDesign: v.hasDesign }));
  let parsed: ModelFile | null = null;
  try {
    parsed = file ? (JSON.parse(file.text) as ModelFile) : null;
  } catch {
    parsed = null;
  }
  const d = parsed?.design;
  const dispLimits = d?.constraints?.displacement ?? [];
  const defaults: QueueDefaults = {
    formulation: d?.formulation ?? "nested",
    objective: d?.objective ?? "mass",
    maxIterations: d?.solver?.maxIterations ?? null,
    tolerance: d?.solver?.tolerance ?? null,
    displacementLimit: dispLimits.length ? minOf(dispLimits.map((l) => l.limit)) : null,
    volumeMax: d?.constraints?.volume?.max ?? null,
    stress: d?.constraints?.stress ?? null,
    buckling: d ? !!d.constraints?.buckling : null,
    lengthUnit: parsed?.units.length ?? "",
  };
  return {
    model: { ...model, summary: (model.summary ?? {}) as SummaryLike },
    project: project ?? null,
    uploaderName: (uploader as { name: string } | undefined)?.name ?? null,
    file: parsed && {
      description: parsed.description ?? null,
      units: parsed.units,
      materials: parsed.materials,
      loadCases: parsed.loadCases.map((lc) => ({
        id: lc.id,
        name: lc.name ?? null,
        count: lc.loads.length,
        total: lc.loads.reduce((s, l) => [s[0]! + (l.fx ?? 0), s[1]! + (l.fy ?? 0), s[2]! + (l.fz ?? 0)], [0, 0, 0]),
      })),
      design: d
        ? {
            objective: d.objective ?? "mass",
            formulation: d.formulation ?? "nested",
            groups: d.groups?.length ?? 0,
            shape: d.shape ?? [],
            areaBounds: d.areaBounds ?? null,
            limits: [
              d.constraints?.stress ? "stress" : null,
              dispLimits.length ? `displacement (${dispLimits.length})` : null,
              d.constraints?.volume ? "volume" : null,
              d.constraints?.buckling ? "buckling" : null,
            ].filter(Boolean) as string[],
          }
        : null,
      topology: {
        dimension: parsed.dimension,
        units: parsed.units,
        nodes: parsed.nodes.map((n) => ({ id: n.id, x: n.x, y: n.y, z: n.z, fixed: n.fixed })),
        members: parsed.members.map((m) => ({ id: m.id, start: m.start, end: m.end, area: m.area, group: m.group })),
        loadCases: parsed.loadCases.map((lc) => ({ id: lc.id, name: lc.name, loads: lc.loads })),
      } satisfies ModelLike,
    },
    defaults,
    versions,
    jobs: await toJobRows(jobs.jobs),
    may: { queue: can(user.role, "create:job") && model.hasDesign, canCreateJob: can(user.role, "create:job"), edit: can(user.role, "create:model") },
    answers: new URL(request.url).searchParams.get("answers"),
  };
});

export const action = withDependencies(async function action({ request, params }: Route.ActionArgs) {
  const { user } = await requireModel(request, params.modelId, "create:job");
  const form = await request.formData();
  const parsed = parseQueueForm((n) => form.get(n));
  if (!parsed.ok) return data({ fieldErrors: parsed.fieldErrors }, { status: 400 });
  try {
    const answers = form.get("answers");
    const job = await enqueueJob({ modelId: params.modelId, options: parsed.options, user, answers: typeof answers === "string" && answers ? answers : null });
    await audit({ request, actor: user, action: "job.submit", entityType: "job", entityId: job.id, detail: { modelId: job.modelId, options: job.options } });
    throw redirect(`/jobs/${job.id}`);
  } catch (e) {
    if (e instanceof Response && e.status >= 400) {
      const body = (await e.json().catch(() => null)) as { error?: string } | null;
      return data({ fieldErrors: { form: body?.error ?? "The job was not queued" } }, { status: e.status });
    }
    throw e;
  }
});

export function ErrorBoundary() {
  return <RouteError what="model" />;
}

export default function ModelPage({ loaderData, actionData }: Route.ComponentProps) {
  const { model, project, file, defaults, jobs, may, uploaderName } = loaderData;
  const s = model.summary;
  const u = file?.units;
  const stressUnit = u ? unitLabel("stress", u as Units) : "";
  const stability = s.stability;
  return (
    <div className="space-y-6">
      <header>
        {project && (
          <p className="text-sm text-ink-muted">
            <Link to={`/projects/${project.id}`} className="hover:underline">
              {project.code} · {project.name}
            </Link>
          </p>
        )}
        <h1 className="mt-1 text-2xl font-semibold sm:text-3xl">{model.name}</h1>
        {file?.description && <p className="mt-2 max-w-3xl text-ink-soft">{file.description}</p>}
        <p className="mt-2 text-sm text-ink-muted">
          {model.fileName} · {formatBytes(model.sizeBytes)} · uploaded {formatDateTime(model.createdAt)}
          {uploaderName && <> by {uploaderName}</>}
        </p>
        <p className="mt-1 break-all font-mono text-2xs text-ink-muted" data-testid="model-sha256">
          SHA-256 {model.sha256}
        </p>
      </header>

      <section className="card" aria-label="Summary">
        <dl className="grid grid-cols-2 gap-x-6 gap-y-4 sm:grid-cols-4 lg:grid-cols-7">
          <Stat label="dimension" value={`${model.dimension}D`} />
          <Stat label="nodes" value={model.nodeCount} />
          <Stat label="members" value={model.memberCount} />
          <Stat label="load cases" value={file?.loadCases.length ?? s.counts?.loadCases ?? "–"} />
          {s.totalLength !== undefined && <Stat label={`total length (${u?.length})`} value={formatNumber(s.totalLength)} />}
          {s.initialVolume !== undefined && <Stat label={`volume (${u?.length}³)`} value={formatNumber(s.initialVolume)} />}
          {s.initialMass !== undefined && <Stat label={`mass (${u?.mass})`} value={formatNumber(s.initialMass)} />}
        </dl>
        {stability && (
          <p className={`mt-4 rounded-md px-3 py-2 text-sm ${stability.ok ? "bg-ok-wash text-ok" : "bg-bad-wash text-bad"}`} data-testid="stability">
            {/^(stable|not stable|unstable)/i.test(stability.message) ? (
              stability.message.charAt(0).toUpperCase() + stability.message.slice(1)
            ) : (
              <>
                <strong>{stability.ok ? "Stable: " : "Not stable: "}</strong>
                {stability.message}
              </>
            )}
          </p>
        )}
      </section>

      {model.warnings.length > 0 && <IssueList title="Worth a second look" issues={model.warnings} tone="warn" />}

      <ModelVersions modelId={model.id} versions={loaderData.versions} mayEdit={may.edit} />

      {file ? <TrussViewer model={file.topology} title="Initial geometry" /> : <EmptyState title="The model file could not be read" />}

      {file && (
        // stacked, not side by side: five number columns need the full width (issue 16)
        <div className="grid gap-6">
          <section className="card min-w-0" aria-label="Materials">
            <h2 className="mb-3 font-semibold">Materials</h2>
            <div className="overflow-x-auto">
              <table className="data-table">
                <thead>
                  <tr>
                    <th>material</th>
                    <th className="num whitespace-nowrap">modulus E ({stressUnit})</th>
                    <th className="num whitespace-nowrap">density ({u?.mass}/{u?.length}³)</th>
                    <th className="num whitespace-nowrap">allowable tension ({stressUnit})</th>
                    <th className="num whitespace-nowrap">allowable compression ({stressUnit})</th>
                  </tr>
                </thead>
                <tbody>
                  {file.materials.map((m) => (
                    <tr key={m.id}>
                      <td>{m.name ? `${m.id} (${m.name})` : m.id}</td>
                      <td className="num whitespace-nowrap">{formatNumber(m.E)}</td>
                      <td className="num whitespace-nowrap">{formatNumber(m.density)}</td>
                      <td className="num whitespace-nowrap">{formatNumber(m.allowableTension)}</td>
                      <td className="num whitespace-nowrap">{formatNumber(m.allowableCompression)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>
          <section className="card min-w-0" aria-label="Load cases">
            <h2 className="mb-3 font-semibold">Load cases</h2>
            <div className="overflow-x-auto">
              <table className="data-table">
                <thead>
                  <tr>
                    <th>load case</th>
                    <th className="num whitespace-nowrap">loads</th>
                    <th className="num whitespace-nowrap">Σfx ({u?.force})</th>
                    <th className="num whitespace-nowrap">Σfy ({u?.force})</th>
                    <th className="num whitespace-nowrap">Σfz ({u?.force})</th>
                  </tr>
                </thead>
                <tbody>
                  {file.loadCases.map((lc) => (
                    <tr key={lc.id}>
                      <td>{lc.name ? `${lc.id} — ${lc.name}` : lc.id}</td>
                      <td className="num whitespace-nowrap">{lc.count}</td>
                      {lc.total.map((t, i) => (
                        <td key={i} className="num whitespace-nowrap">
                          {formatNumber(t)}
                        </td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>
        </div>
      )}

      <section className="card" aria-label="Design problem">
        <h2 className="mb-3 font-semibold">Design problem</h2>
        {file?.design ? (
          <dl className="grid grid-cols-2 gap-x-6 gap-y-3 text-sm sm:grid-cols-4">
            <Stat label="objective" value={`minimum ${file.design.objective}`} words />
            <Stat label="formulation" value={formulationWords(file.design.formulation)} wrap words />
            <Stat label="area groups" value={file.design.groups} />
            <Stat label="shape variables" value={file.design.shape.length} />
            <Stat label="limits" value={file.design.limits.join(", ") || "none"} wrap />
            {file.design.areaBounds && <Stat label={`area bounds (${u?.length}²)`} value={`${formatNumber(file.design.areaBounds.min)} – ${formatNumber(file.design.areaBounds.max)}`} wrap />}
          </dl>
        ) : (
          <EmptyState title="No design block">This file can be analysed but not optimized: add a design block (objective, bounds, limits) and upload it again.</EmptyState>
        )}
        {may.queue && (
          <div className="mt-6 border-t border-rule pt-5" id="queue">
            <h3 className="mb-3 font-semibold">Queue an optimization</h3>
            <QueueForm defaults={defaults} serverErrors={actionData?.fieldErrors} answers={loaderData.answers} />
          </div>
        )}
        {!may.canCreateJob && file?.design && <p className="mt-4 text-sm text-ink-muted">Engineers and admins queue optimization runs; your role can read the results.</p>}
      </section>

      <section className="card min-w-0" aria-label="Jobs of this model">
        <h2 className="mb-3 font-semibold">Runs of this model</h2>
        <JobsList rows={jobs} selectable showProject={false} showModel={false} pollUrl={`/api/jobs?modelId=${model.id}&limit=20`} empty={<EmptyState title="No runs yet">{may.queue ? "Queue the first one above." : "An engineer queues runs from this page."}</EmptyState>} />
      </section>
    </div>
  );
}
