// Marks drawn on every page once the whole document exists: the running header, the review
// state banner (a NOT REVIEWED mark and watermark until a checker approves), and the footer
// with the short caution and "page n of m".
import { CAUTION_SHORT } from "./cautions";
import { formatDateTime } from "~/lib/format";
import { MARGIN, PAGE_SIZE, type ReportWriter } from "./layout";
import { BAD, BAD_WASH, INK, INK_MUTED, OK, OK_WASH, RULE, WARN, WARN_WASH } from "./palette";
import type { ReviewState } from "./report-data";
import { TONE_COLORS } from "~/lib/job-state";

export function reviewBanner(state: ReviewState): { text: string; color: string; wash: string; watermark: string | null } {
  switch (state.kind) {
    case "nothing-to-review": {
      const c = TONE_COLORS[state.state.tone];
      return { text: `NOT A DESIGN TO ISSUE: ${state.state.sentence}; no checker is asked to review it`, color: c.ink, wash: c.wash, watermark: "NOT A DESIGN" };
    }
    case "not-reviewed":
      return { text: "NOT REVIEWED — no checker has approved this calculation", color: BAD, wash: BAD_WASH, watermark: "NOT REVIEWED" };
    case "changes-requested":
      return {
        text: `CHANGES REQUESTED — NOT APPROVED (${state.review.reviewer}, ${formatDateTime(state.review.at, { seconds: true })})`,
        color: WARN,
        wash: WARN_WASH,
        watermark: "NOT APPROVED",
      };
    case "approved":
      return { text: `APPROVED by ${state.review.reviewer} on ${formatDateTime(state.review.at, { seconds: true })}`, color: OK, wash: OK_WASH, watermark: null };
  }
}

export function drawPageMarks(w: ReportWriter, opts: { left: string; right: string; state: ReviewState }) {
  const doc = w.doc;
  const range = doc.bufferedPageRange();
  const banner = reviewBanner(opts.state);
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    // nothing here may flow: drawing below the bottom margin would otherwise add a page
    const savedBottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;

    if (banner.watermark) {
      doc.save();
      doc.rotate(-35, { origin: [PAGE_SIZE[0] / 2, PAGE_SIZE[1] / 2] });
      doc.fillOpacity(0.07);
      const size = 78;
      const width = w.measure("sans-bold", size, banner.watermark);
      w.line("sans-bold", size, banner.watermark, PAGE_SIZE[0] / 2 - width / 2, PAGE_SIZE[1] / 2 - size / 2, { color: banner.color });
      doc.restore();
    }

    w.line("sans-semibold", 8, opts.left, w.left, 24, { color: INK, width: w.width * 0.45 });
    w.line("sans", 8, opts.right, w.left + w.width * 0.45, 24, { color: INK_MUTED, width: w.width * 0.55, align: "right" });
    doc.rect(w.left, 38, w.width, 18).fill(banner.wash);
    doc.rect(w.left, 38, 3, 18).fill(banner.color);
    w.line("sans-bold", 8.5, banner.text, w.left + 10, 42.5, { color: banner.color, width: w.width - 16 });

    const fy = PAGE_SIZE[1] - MARGIN.bottom + 18;
    doc.moveTo(w.left, fy - 6).lineTo(w.right, fy - 6).lineWidth(0.5).strokeColor(RULE).stroke();
    w.line("sans", 7, CAUTION_SHORT, w.left, fy, { color: INK_MUTED, width: w.width - 80 });
    w.line("sans", 7, `page ${i - range.start + 1} of ${range.count}`, w.right - 80, fy, { color: INK_MUTED, width: 80, align: "right" });

    doc.page.margins.bottom = savedBottom;
  }
}
