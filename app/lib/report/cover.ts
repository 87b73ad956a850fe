// The cover page: what was computed, by whom, from which file, and its review state, followed
// by the cautions and the record of review decisions.
import { CAUTION_TEXT, CAUTION_TITLE } from "./cautions";
import { formatDateTime, formatNumber } from "~/lib/format";
import type { ReportWriter } from "./layout";
import { BAD, BAD_WASH, BRASS, BRASS_WASH, INK, INK_MUTED, INK_SOFT, OK, OK_WASH, WARN, WARN_WASH } from "./palette";
import { reviewState, type ReportData } from "./report-data";
import { reviewStateWords } from "~/components/job/review-words";
import { jobState, TONE_COLORS } from "~/lib/job-state";

/** What the solver's outcome means, after the job-state sentence of every list and page. */
const STATUS_DETAIL: Record<string, string> = {
  optimal: "the solver met its optimality and feasibility tolerances",
  "not-converged": "the solver stopped before meeting its tolerances",
  infeasible: "no design within the bounds meets every limit",
  failed: "the solver could not complete",
  analysed: "the model as given (its own areas), no optimization",
};

/** A report exists for a finished job: "finished — optimal: the solver met its ... tolerances". */
export function statusWords(status: string): string {
  const sentence = jobState({ status: "succeeded", outcome: status }).sentence;
  return STATUS_DETAIL[status] ? `${sentence}: ${STATUS_DETAIL[status]}` : sentence;
}

function box(w: ReportWriter, color: string, wash: string, title: string, lines: string[]) {
  const doc = w.doc;
  const innerW = w.width - 24;
  const h = 22 + lines.reduce((s, l) => s + w.paragraphHeight(l, { size: 9, width: innerW }) + 3, 0) + 8;
  w.ensure(h + 6);
  const y = w.y;
  doc.rect(w.left, y, w.width, h).fill(wash);
  doc.rect(w.left, y, 4, h).fill(color);
  w.line("sans-bold", 10, title, w.left + 14, y + 8, { color });
  w.y = y + 24;
  for (const l of lines) w.paragraph(l, { size: 9, x: w.left + 14, width: innerW, gap: 3, color: INK_SOFT });
  w.y = y + h + 10;
}

export function reviewBox(w: ReportWriter, data: ReportData) {
  const state = reviewState(data.reviews, data.result);
  if (state.kind === "nothing-to-review") {
    const c = TONE_COLORS[state.state.tone];
    box(w, c.ink, c.wash, "NOT A DESIGN TO ISSUE", [
      `This run is ${state.state.sentence}. It produced no design to sign off, so no checker is asked to review it; this record documents the attempt and must not be issued or relied on as a design.`,
    ]);
  } else if (state.kind === "not-reviewed") {
    box(w, BAD, BAD_WASH, "NOT REVIEWED", [
      "No checker has approved this calculation yet. It must not be issued or relied on until an independent checker has reviewed and approved it.",
    ]);
  } else if (state.kind === "changes-requested") {
    box(w, WARN, WARN_WASH, "CHANGES REQUESTED — NOT APPROVED", [
      `Checked by ${state.review.reviewer} on ${formatDateTime(state.review.at, { seconds: true })}, who returned it with changes requested.`,
      `Comment: ${state.review.comment || "(none)"}`,
    ]);
  } else {
    box(w, OK, OK_WASH, "APPROVED", [
      `Checked and approved by ${state.review.reviewer} on ${formatDateTime(state.review.at, { seconds: true })}.`,
      `Comment: ${state.review.comment || "(none)"}`,
    ]);
  }
}

export function cautionsBox(w: ReportWriter) {
  box(w, BRASS, BRASS_WASH, CAUTION_TITLE, [CAUTION_TEXT]);
}

export function coverPage(w: ReportWriter, data: ReportData) {
  const { job, project, model, result } = data;
  w.y = 96;
  w.line("sans", 10, "STRUTWISE · CALCULATION RECORD", w.left, w.y, { color: INK_MUTED });
  w.y += 18;
  w.paragraph("Truss optimization", { face: "sans-bold", size: 24, gap: 2 });
  w.paragraph(model.name, { face: "sans", size: 15, color: INK_SOFT, gap: 6 });
  // the job's state in the one sentence and colour of the pages and the mail (the marks beside
  // the page badges are not in the shipped fonts; the sentence reads without colour on its own)
  const state = jobState({ status: job.status, outcome: result.status });
  w.paragraph(state.sentence, { face: "sans-semibold", size: 11, color: TONE_COLORS[state.tone].ink, gap: 14 });

  const solver = result.solver ? `${result.solver.name} ${result.solver.version}` : "not recorded in the result";
  w.facts([
    ["Project", `${project.code} — ${project.name}`],
    ...(project.client ? ([["Client", project.client]] as [string, string][]) : []),
    ["Model", `${model.name} (file ${model.fileName}, ${formatNumber(model.sizeBytes / 1024, { sig: 3 })} KiB)`],
    ["Job", job.id],
    ["Submitted by", job.submitter ?? "unknown"],
    ["Queued", formatDateTime(job.createdAt, { seconds: true })],
    ["Started", formatDateTime(job.startedAt, { seconds: true })],
    ["Finished", formatDateTime(job.finishedAt, { seconds: true })],
    ["Solver", `${solver}${result.formulation ? `, ${result.formulation} formulation` : ""}`],
    ["State", statusWords(result.status)],
    ["Report generated", formatDateTime(data.generatedAt, { seconds: true })],
  ]);
  w.facts([["Input file SHA-256", model.sha256]], { monoValues: true, size: 8 });
  w.space(6);
  reviewBox(w, data);
  cautionsBox(w);

  if (data.reviews.length > 0) {
    w.line("sans-semibold", 9.5, "Review record", w.left, w.y, { color: INK });
    w.y += 14;
    w.paragraph("Decisions are kept in the order they were made; the latest one sets the state of this report.", { size: 8, color: INK_MUTED });
    // a list, not a table: a checker's comment is part of the record and is never cut short
    for (const r of data.reviews) {
      const head = `${formatDateTime(r.at, { seconds: true })} · ${r.reviewer} · ${reviewStateWords(r.decision)}`;
      w.ensure(14 + w.paragraphHeight(r.comment || "(no comment)", { size: 8.5, width: w.width - 14 }));
      w.line("sans-semibold", 8.5, head, w.left, w.y, { color: r.decision === "approved" ? OK : r.decision === "reopened" ? INK_MUTED : WARN, width: w.width });
      w.y += 12;
      w.paragraph(r.comment || "(no comment)", { size: 8.5, x: w.left + 14, gap: 6, color: INK_SOFT });
    }
  }
  w.doc.fillColor(INK);
}
