import type { Metadata } from "next";
import { DisposalStatementView } from "./disposal-statement-view";

export const metadata: Metadata = { title: "Signed statement" };

export default async function DisposalStatementPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ saved?: string }>;
}) {
  const { id } = await params;
  const { saved } = await searchParams;
  return <DisposalStatementView id={id} saved={saved === "1"} />;
}
