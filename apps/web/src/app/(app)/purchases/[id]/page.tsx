import type { Metadata } from "next";
import { PurchaseView } from "./purchase-view";

export const metadata: Metadata = { title: "Purchase" };

export default async function PurchasePage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ saved?: string }>;
}) {
  const { id } = await params;
  const { saved } = await searchParams;
  return <PurchaseView id={id} saved={saved === "1"} />;
}
