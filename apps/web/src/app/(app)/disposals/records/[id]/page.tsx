import type { Metadata } from "next";
import { DisposalRecordView } from "./disposal-record-view";

export const metadata: Metadata = { title: "Disposal record" };

export default async function DisposalRecordPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ saved?: string }>;
}) {
  const { id } = await params;
  const { saved } = await searchParams;
  return <DisposalRecordView id={id} saved={saved === "1"} />;
}
