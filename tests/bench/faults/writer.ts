/**
 * One "server" of the fault bench (../faults.ts): reads create requests (one JSON line each) from
 * stdin and handles them concurrently the way a creating route does with an Idempotency-Key — the
 * job and its key in one write transaction (IMMEDIATE on SQLite), a repeat answered from the key —
 * and acknowledges each on stdout only after the commit. The bench kills it with SIGKILL at random.
 */
import readline from "node:readline";
import { createJob, createDb, findIdempotentAnswer, saveIdempotentAnswer, writeTransaction } from "../../../packages/db/src/index";

const db = createDb(process.env.FAULT_DB!);
const f = JSON.parse(process.env.FAULT_FIXTURE!) as {
  org: number;
  tech: number;
  north: number;
  appliance: number;
  cylinder: number;
  equipment: number;
};

async function handle(line: string): Promise<void> {
  const { key } = JSON.parse(line) as { key: string };
  try {
    const answer = await writeTransaction(db, async (trx) => {
      const earlier = await findIdempotentAnswer(trx, { userId: f.tech, key });
      if (earlier) return { ...(JSON.parse(earlier.body) as { id: number }), replayed: true };
      const id = await createJob(trx, {
        actor: { userId: f.tech, organisationId: f.org },
        branchId: f.north,
        input: {
          kind: "recovery",
          applianceId: f.appliance,
          performedOn: "2026-03-14",
          refrigerant: "R-410A",
          recoveredAmount: 5,
          recoveredUnit: "g",
          cylinderId: f.cylinder,
          equipmentId: f.equipment,
          evacuationValue: 15,
          evacuationUnit: "in_hg_vacuum",
          accessMethod: "service_valve",
          notes: `fault bench ${key}`,
        } as never,
      });
      await saveIdempotentAnswer(trx, {
        userId: f.tech,
        organisationId: f.org,
        key,
        answer: {
          method: "POST",
          path: "/api/jobs",
          requestHash: key,
          status: 201,
          body: JSON.stringify({ id }),
          contentType: "application/json",
        },
      });
      return { id, replayed: false };
    });
    process.stdout.write(`${JSON.stringify({ key, ...answer })}\n`);
  } catch (err) {
    process.stdout.write(`${JSON.stringify({ key, error: err instanceof Error ? err.message : String(err) })}\n`);
  }
}

db.raw("SELECT 1")
  .then(() => {
    process.stdout.write("ready\n");
    readline.createInterface({ input: process.stdin }).on("line", (line) => void handle(line));
  })
  .catch((err: unknown) => {
    console.error(err);
    process.exit(1);
  });
