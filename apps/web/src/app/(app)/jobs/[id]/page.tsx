import type { Metadata } from "next";
import { JobDetail } from "./job-detail";

export const metadata: Metadata = { title: "Job" };

export default async function JobPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ saved?: string }>;
}) {
  const { id } = await params;
  const { saved } = await searchParams;
  return <JobDetail id={id} saved={saved === "1"} />;
}
