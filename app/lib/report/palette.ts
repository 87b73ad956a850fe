// Report colours: the design tokens of app/app.css (a test keeps them equal), and the
// utilization bands of the result pages' legend (components/viewer/palette.ts): a member at
// its limit reads 1.000 give or take solver tolerance, so "over" starts half a per cent above 1.
export const INK = "#16202c";
export const INK_SOFT = "#3b4757";
export const INK_MUTED = "#6b7683";
export const RULE = "#d9d3c7";
export const PAPER_SUNK = "#ebe7de";
export const BRASS = "#c9862a";
export const BRASS_STRONG = "#9c6314";
export const BRASS_WASH = "#f7ead3";
export const OK = "#2f7d5b";
export const OK_WASH = "#e2f1e8";
export const WARN = "#a86a00";
export const WARN_WASH = "#fbefd6";
export const BAD = "#b3362c";
export const BAD_WASH = "#f8e1de";
export const INFO = "#2c5d8a";
export const TENSION = "#2a6f97";
export const COMPRESSION = "#b4502b";

export const TOKENS: Record<string, string> = {
  "--color-ink": INK,
  "--color-ink-soft": INK_SOFT,
  "--color-ink-muted": INK_MUTED,
  "--color-rule": RULE,
  "--color-paper-sunk": PAPER_SUNK,
  "--color-brass": BRASS,
  "--color-brass-strong": BRASS_STRONG,
  "--color-brass-wash": BRASS_WASH,
  "--color-ok": OK,
  "--color-ok-wash": OK_WASH,
  "--color-warn": WARN,
  "--color-warn-wash": WARN_WASH,
  "--color-bad": BAD,
  "--color-bad-wash": BAD_WASH,
  "--color-info": INFO,
  "--color-tension": TENSION,
  "--color-compression": COMPRESSION,
};

