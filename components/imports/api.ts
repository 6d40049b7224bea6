export { ApiError, fetchJson } from "@/components/ui/fetch-json";

export type ImportSummary = {
  id: number;
  kind: string;
  fileName: string;
  sizeBytes: number;
  status: string;
  bytesRead: number;
  rowsTotal: number;
  rowsImported: number;
  rowsDuplicate: number;
  rowsWarning: number;
  rowsRejected: number;
  vehiclesCreated: number;
  error: string | null;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  cancelRequestedAt: string | null;
  undoneAt: string | null;
  createdByName: string | null;
};
