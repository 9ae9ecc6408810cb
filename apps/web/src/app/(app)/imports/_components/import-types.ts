// The shapes the import routes return, as the browser receives them.
import type { ImportDetail, ImportIssueRow, ImportListRow } from "@coldtrail/db";

export interface ImportView extends ImportDetail {
  running: boolean;
}
export type { ImportIssueRow, ImportListRow };
export interface Paged<T> {
  rows: T[];
  total: number;
  page: number;
  pageSize: number;
}
