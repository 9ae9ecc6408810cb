import type { Metadata } from "next";
import { ShipmentView } from "./shipment-view";

export const metadata: Metadata = { title: "Reclaim shipment" };

export default async function ShipmentPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ saved?: string }>;
}) {
  const { id } = await params;
  const { saved } = await searchParams;
  return <ShipmentView id={id} saved={saved === "1"} />;
}
