import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { PlannedScreen } from "@/components/ui/planned-screen";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Imports" };

export default async function ImportsPage() {
  await requirePage("imports:read");
  return (
    <>
      <PageHeader
        title={"Imports"}
        description={"Repair orders, fault codes, fill-ups, rosters and parts in from CSV."}
      />
      <PlannedScreen
        what={
          "Imports will take CSV files of every data kind, map their columns, validate every row and load them atomically."
        }
        points={[
          "Drag-and-drop upload with progress; the same file twice is recognised",
          "Column mapping remembered per organisation; units, date formats and decimal commas handled",
          "Rejected rows reported with row number and reason; any import can be undone",
        ]}
      />
    </>
  );
}
