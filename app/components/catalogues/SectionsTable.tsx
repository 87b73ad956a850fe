// The sections of one catalogue: sortable, filterable, with the radius of gyration √(I/A)
// beside each (what the Euler check uses) and a CSV of every row, units in the headers.
import { createColumnHelper } from "@tanstack/react-table";
import { useMemo } from "react";
import { DataTable } from "~/components/tables/DataTable";
import { downloadText, fileSlug, toCsv } from "~/components/tables/csv";
import { formatNumber } from "~/lib/format";
import type { CatalogueSection } from "~/lib/catalogues/types";

export function SectionsTable({ name, sections, dimensionNames }: { name: string; sections: CatalogueSection[]; dimensionNames: string[] }) {
  const hasMass = sections.some((s) => s.massPerLength !== undefined);
  const col = createColumnHelper<CatalogueSection>();
  const columns = useMemo(
    () => [
      col.accessor("id", { header: "section" }),
      col.accessor("family", { header: "family" }),
      col.accessor("area", { header: "area (mm²)", cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } }),
      col.accessor("I", { header: "I (mm⁴)", cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } }),
      col.accessor((s) => Math.sqrt(s.I / s.area), { id: "r", header: "r = √(I/A) (mm)", cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } }),
      ...dimensionNames.map((d) => col.accessor((s) => s.dimensions?.[d], { id: `dim-${d}`, header: `${d} (mm)`, cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } })),
      ...(hasMass ? [col.accessor((s) => s.massPerLength, { id: "mass", header: "mass (kg/m)", cell: (c) => formatNumber(c.getValue()), meta: { numeric: true } })] : []),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [dimensionNames, hasMass],
  );
  const csv = () => {
    const header = ["id", "family", "area_mm2", "I_mm4", ...dimensionNames.map((d) => `${d}_mm`), ...(hasMass ? ["mass_kg_per_m"] : [])];
    const rows = sections.map((s) => [s.id, s.family, s.area, s.I, ...dimensionNames.map((d) => s.dimensions?.[d]), ...(hasMass ? [s.massPerLength] : [])]);
    downloadText(`${fileSlug(name)}.csv`, toCsv(header, rows));
  };
  return (
    <DataTable
      label="Sections"
      data={sections}
      columns={columns}
      pageSize={50}
      filterPlaceholder="Filter sections…"
      initialSort={[{ id: "area", desc: false }]}
      getRowId={(s) => s.id}
      rowTestId="section-row"
      toolbar={
        <button type="button" className="btn btn-secondary px-3 py-1" onClick={csv} data-testid="sections-csv">
          Sections CSV
        </button>
      }
    />
  );
}
