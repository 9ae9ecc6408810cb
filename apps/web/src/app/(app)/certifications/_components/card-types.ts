// The shapes the card routes return, as the browser receives them.
import type { CertificationDetail, CertificationListResult, CertificationListRow } from "@coldtrail/db";

export type CardRow = CertificationListRow;
export type CardPage = CertificationListResult;
export interface CardDetail extends CertificationDetail {
  can: { verify: boolean; correct: boolean; withdraw: boolean };
}

/** Where a card's file or thumbnail is served (after the server's permission check). */
export const cardFileUrl = (id: number, variant: "card" | "thumbnail" = "card") => `/api/files/certifications/${id}?variant=${variant}`;
