// The three tables of a spreadsheet model and their columns (api.md, "Additions"): the one
// home of the column names, shared by the CSV and workbook readers, the writers (templates,
// downloads) and the editor's paste.
export const TABLES = ["nodes", "members", "loads"] as const;
export type TableName = (typeof TABLES)[number];

/** Required columns first, then optional ones the model additions use. */
export const COLUMNS: Record<TableName, { required: readonly string[]; optional: readonly string[] }> = {
  nodes: { required: ["id", "x", "y"], optional: ["z", "fixed"] },
  members: { required: ["id", "start", "end", "material"], optional: ["area", "group", "section", "bucklingFactor"] },
  loads: { required: ["case", "node"], optional: ["fx", "fy", "fz"] },
};

/** The header a template and an export write: every column, required and optional. */
export const HEADERS: Record<TableName, string[]> = {
  nodes: ["id", "x", "y", "z", "fixed"],
  members: ["id", "start", "end", "material", "area", "group", "section", "bucklingFactor"],
  loads: ["case", "node", "fx", "fy", "fz"],
};

/** One table as read from a file or sheet: where it came from, its header, its rows. */
export interface RawTable {
  /** how messages name it: "members.csv" or "sheet members of frame.xlsx" */
  source: string;
  header: string[];
  /** rows numbered as a spreadsheet shows them: the header is row 1 */
  rows: { row: number; cells: string[] }[];
}

export interface ImportProblem {
  path: string;
  message: string;
}
