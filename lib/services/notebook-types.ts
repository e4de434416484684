// The plain shapes of a notebook and of a run as a notebook lists it, as the notebooks service returns
// them: what pages and the API see; no Sequelize instance or column name gets past the service.
import type { SourceKind } from "@/lib/spectrum/types";
import type { RunStatus } from "@/lib/runs/types";

export interface NotebookRecord {
  id: string;
  teamId: string;
  title: string;
  /** Optimistic lock: a rename sends the version it was made from. */
  version: number;
  createdAt: string;
  /** The newest of the notebook's own change and its runs' creation or change. */
  lastActivityAt: string;
  runCount: number;
  statusCounts: Record<RunStatus, number>;
}

/** One run as a notebook lists it. */
export interface RunSummary {
  id: string;
  status: RunStatus;
  /** 1 for the first version; amendments count up. */
  versionNumber: number;
  spectrumId: string;
  spectrumLabel: string;
  spectrumFileName: string;
  instrumentId: string;
  instrumentName: string;
  source: SourceKind;
  /** Species whose standing verdict (after overrides) is present. */
  present: string[];
  authorId: string | null;
  authorName: string | null;
  createdAt: string;
}
