import type { APIRequestContext, APIResponse, Browser, BrowserContext } from "@playwright/test";
import { DEMO, contextAs, expect, test } from "./fixtures";

/**
 * Every admin route, role by role: the owner and officer of the organisation, the Columbus branch
 * manager (own branch / another branch), the Columbus technician, the inspector, and the owner and
 * manager of the other organisation. Denied reads of single records answer 404 (nothing tells they
 * exist), denied actions 403, lists leak no rows, and bad input names the field and writes nothing.
 * Writes that must succeed happen in the second organisation or on people this spec creates, so the
 * demo sign-ins of organisation 1 stay as they are for the other specs.
 */

test.describe.configure({ mode: "serial" });

const ROLES = {
  owner: DEMO.owner,
  officer: DEMO.officer,
  manager: DEMO.managerColumbus,
  technician: DEMO.technicianColumbus,
  inspector: DEMO.inspector,
  otherOwner: DEMO.otherOrgOwner,
  otherManager: DEMO.otherOrgManager,
} as const;
type Who = keyof typeof ROLES;

const stamp = Date.now().toString(36);
const contexts = {} as Record<Who, BrowserContext>;
const api = (who: Who): APIRequestContext => contexts[who].request;
let anonymous: BrowserContext;

let branch: Record<string, number> = {};
let boise = 0;
let columbusTech = 0;
let tucsonManager = 0;
let testPerson = 0;
let testGrant = 0;
let ownerId = 0;
let otherOwnerId = 0;

async function status(res: Promise<APIResponse>): Promise<number> {
  return (await res).status();
}

async function expectStatuses(call: (a: APIRequestContext) => Promise<APIResponse>, expected: Partial<Record<Who | "anonymous", number>>) {
  const actual: Record<string, number> = {};
  for (const who of Object.keys(expected) as (Who | "anonymous")[]) {
    actual[who] = await status(call(who === "anonymous" ? anonymous.request : api(who)));
  }
  expect(actual).toEqual(expected);
}

async function peopleIds(a: APIRequestContext, qs = ""): Promise<number[]> {
  const res = await a.get(`/api/admin/people?pageSize=200${qs}`);
  expect(res.status()).toBe(200);
  return ((await res.json()) as { rows: { id: number }[] }).rows.map((r) => r.id);
}

test.beforeAll(async ({ browser }: { browser: Browser }) => {
  for (const [who, email] of Object.entries(ROLES)) contexts[who as Who] = await contextAs(browser, email);
  anonymous = await browser.newContext();
  const b = (await (await api("owner").get("/api/admin/branches?pageSize=200")).json()) as { rows: { id: number; code: string }[] };
  branch = Object.fromEntries(b.rows.map((r) => [r.code, r.id]));
  const ob = (await (await api("otherOwner").get("/api/admin/branches?pageSize=200")).json()) as { rows: { id: number; code: string }[] };
  boise = ob.rows.find((r) => r.code === "BOI")!.id;
  const find = async (q: string, who: Who = "owner") =>
    ((await (await api(who).get(`/api/admin/people?q=${encodeURIComponent(q)}`)).json()) as { rows: { id: number }[] }).rows[0]!.id;
  columbusTech = await find("delacroix-byrd");
  tucsonManager = await find("baptiste-moreno");
  ownerId = await find("halvorsen");
  otherOwnerId = await find("holloway", "otherOwner");

  // A person of our own to change and deactivate: a Columbus technician, invited by the owner.
  const invited = await api("owner").post("/api/admin/invitations", {
    data: { email: `authz.person.${stamp}@kestrelmoor.example`, name: "Matrix Person", roles: ["technician"], branchIds: [branch.COL] },
  });
  expect(invited.status()).toBe(201);
  testPerson = ((await invited.json()) as { userId: number }).userId;
});

test.afterAll(async () => {
  // Leave nobody active behind: the person made here never accepted, so withdrawing deactivates them.
  if (testPerson) await api("owner").delete(`/api/admin/people/${testPerson}/invitation`);
  for (const c of Object.values(contexts)) await c.close();
  await anonymous.close();
});

test("people list: scoped to the organisation and, for a manager, their branch", async () => {
  await expectStatuses((a) => a.get("/api/admin/people"), {
    anonymous: 401,
    owner: 200,
    officer: 200,
    manager: 200,
    technician: 403,
    inspector: 403,
    otherOwner: 200,
  });
  const ownerSees = await peopleIds(api("owner"));
  const managerSees = await peopleIds(api("manager"));
  const otherSees = await peopleIds(api("otherOwner"));
  expect(ownerSees).toEqual(expect.arrayContaining([columbusTech, tucsonManager, testPerson]));
  expect(managerSees).toContain(columbusTech);
  expect(managerSees).not.toContain(tucsonManager);
  expect(managerSees).not.toContain(ownerId);
  expect(otherSees.filter((id) => ownerSees.includes(id))).toEqual([]);
});

test("one person: own branch, other branch, other organisation", async () => {
  await expectStatuses((a) => a.get(`/api/admin/people/${columbusTech}`), {
    anonymous: 401,
    owner: 200,
    officer: 200,
    manager: 200,
    technician: 403,
    inspector: 403,
    otherOwner: 404,
    otherManager: 404,
  });
  await expectStatuses((a) => a.get(`/api/admin/people/${tucsonManager}`), { owner: 200, manager: 404, otherOwner: 404 });
  await expectStatuses((a) => a.get(`/api/admin/people/${columbusTech}/certifications`), {
    owner: 200,
    officer: 200,
    manager: 200,
    technician: 404,
    otherOwner: 404,
  });
  await expectStatuses((a) => a.get(`/api/admin/people/${columbusTech}/history`), {
    owner: 200,
    officer: 200,
    technician: 403,
    inspector: 403,
    otherOwner: 404,
  });
  await expectStatuses((a) => a.get("/api/admin/people/not-a-number"), { owner: 404 });
});

test("changing roles and branches: only the owner of the organisation", async () => {
  const body = { roles: ["technician", "branch_manager"], branchIds: [branch.COL] };
  await expectStatuses((a) => a.patch(`/api/admin/people/${testPerson}`, { data: body }), {
    anonymous: 401,
    officer: 403,
    manager: 403,
    technician: 403,
    inspector: 403,
    otherOwner: 404,
    otherManager: 403,
    owner: 200,
  });
  const person = (await (await api("owner").get(`/api/admin/people/${testPerson}`)).json()) as { roles: string[] };
  expect(person.roles).toEqual(["branch_manager", "technician"]);

  // Bad input names the field and changes nothing.
  const bad = await api("owner").patch(`/api/admin/people/${testPerson}`, { data: { roles: ["technician"], branchIds: [] } });
  expect(bad.status()).toBe(400);
  expect((await bad.json()).error.fieldErrors.branchIds[0]).toContain("at least one branch");
  const elsewhere = await api("owner").patch(`/api/admin/people/${testPerson}`, { data: { roles: ["technician"], branchIds: [boise] } });
  expect(elsewhere.status()).toBe(400);
  expect((await elsewhere.json()).error.fieldErrors.branchIds).toBeTruthy();
  expect(((await (await api("owner").get(`/api/admin/people/${testPerson}`)).json()) as { roles: string[] }).roles).toEqual([
    "branch_manager",
    "technician",
  ]);
});

test("nobody raises their own role; the last owner stays an owner and active", async () => {
  // An officer cannot change memberships at all, their own included.
  const officerId = (await peopleIds(api("owner"), "&q=vasquez-lind"))[0]!;
  expect(await status(api("officer").patch(`/api/admin/people/${officerId}`, { data: { roles: ["owner"], branchIds: [] } }))).toBe(403);

  // The owner of the second organisation (its only owner) tries to widen, step down and leave.
  const widen = await api("otherOwner").patch(`/api/admin/people/${otherOwnerId}`, {
    data: { roles: ["owner", "technician"], branchIds: [boise] },
  });
  expect(widen.status()).toBe(403);
  expect((await widen.json()).error.message).toContain("cannot raise your own role");
  const stepDown = await api("otherOwner").patch(`/api/admin/people/${otherOwnerId}`, {
    data: { roles: ["compliance_officer"], branchIds: [] },
  });
  expect(stepDown.status()).toBe(409);
  expect((await stepDown.json()).error.fieldErrors.roles[0]).toContain("is the last owner");
  expect(await status(api("otherOwner").post(`/api/admin/people/${otherOwnerId}/deactivate`))).toBe(403);
  const me = (await (await api("otherOwner").get(`/api/admin/people/${otherOwnerId}`)).json()) as { roles: string[]; status: string };
  expect(me).toMatchObject({ roles: ["owner"], status: "active" });
});

test("deactivating and letting back in: only the owner of the organisation", async () => {
  await expectStatuses((a) => a.post(`/api/admin/people/${columbusTech}/deactivate`), {
    anonymous: 401,
    officer: 403,
    manager: 403,
    technician: 403,
    inspector: 403,
    otherOwner: 404,
  });
  // The test person has not accepted their invitation: withdraw it, then let them in again.
  await expectStatuses((a) => a.delete(`/api/admin/people/${testPerson}/invitation`), {
    officer: 403,
    manager: 403,
    otherOwner: 404,
    owner: 200,
  });
  expect(((await (await api("owner").get(`/api/admin/people/${testPerson}`)).json()) as { status: string }).status).toBe("deactivated");
  await expectStatuses((a) => a.post(`/api/admin/people/${testPerson}/reactivate`), {
    officer: 403,
    manager: 403,
    otherOwner: 404,
    owner: 200,
  });
  expect(await status(api("owner").post(`/api/admin/people/${testPerson}/reactivate`))).toBe(409);
  await expectStatuses((a) => a.post(`/api/admin/people/${testPerson}/invitation`), {
    officer: 403,
    manager: 403,
    otherOwner: 404,
    owner: 200,
  });
});

test("inviting: only the owner, only into their own branches, with field errors for bad input", async () => {
  const body = (n: string) => ({
    email: `authz.${n}.${stamp}@kestrelmoor.example`,
    name: "Someone New",
    roles: ["technician"],
    branchIds: [branch.COL],
  });
  await expectStatuses((a) => a.post("/api/admin/invitations", { data: body("x") }), {
    anonymous: 401,
    officer: 403,
    manager: 403,
    technician: 403,
    inspector: 403,
    otherManager: 403,
  });
  const crossOrg = await api("otherOwner").post("/api/admin/invitations", { data: body("cross") });
  expect(crossOrg.status()).toBe(400);
  expect((await crossOrg.json()).error.fieldErrors.branchIds).toBeTruthy();
  const bad = await api("owner").post("/api/admin/invitations", { data: { email: "not an address", name: "", roles: [] } });
  expect(bad.status()).toBe(400);
  expect(Object.keys((await bad.json()).error.fieldErrors).sort()).toEqual(["email", "name", "roles"]);
  const taken = await api("owner").post("/api/admin/invitations", { data: { ...body("taken"), email: DEMO.technicianColumbus } });
  expect(taken.status()).toBe(409);
  expect((await taken.json()).error.fieldErrors.email).toBeTruthy();
  expect(await peopleIds(api("owner"), `&q=authz.x.${stamp}`)).toEqual([]);
  expect(await peopleIds(api("otherOwner"), `&q=authz.cross.${stamp}`)).toEqual([]);
});

test("branches: read by scope, opened and changed only by the owner of the organisation", async () => {
  await expectStatuses((a) => a.get("/api/admin/branches"), {
    anonymous: 401,
    owner: 200,
    officer: 200,
    manager: 200,
    technician: 200,
    inspector: 200,
    otherOwner: 200,
  });
  const codes = async (who: Who) =>
    ((await (await api(who).get("/api/admin/branches?pageSize=200")).json()) as { rows: { code: string }[] }).rows
      .map((r) => r.code)
      .sort();
  expect(await codes("manager")).toEqual(["COL"]);
  expect(await codes("technician")).toEqual(["COL"]);
  expect(await codes("inspector")).toEqual(["DEN"]);
  expect(await codes("otherOwner")).toEqual(expect.not.arrayContaining(["COL", "TUC", "DEN", "PIA"]));
  await expectStatuses((a) => a.get(`/api/admin/branches/${branch.TUC}`), {
    owner: 200,
    officer: 200,
    manager: 404,
    technician: 404,
    inspector: 404,
    otherOwner: 404,
  });

  const newBranch = {
    name: `Nampa ${stamp}`,
    code: `N${stamp.slice(-5)}`.toUpperCase(),
    timeZone: "America/Boise",
    massUnit: "lb_oz",
    country: "US",
    region: "ID",
  };
  await expectStatuses((a) => a.post("/api/admin/branches", { data: newBranch }), {
    anonymous: 401,
    officer: 403,
    manager: 403,
    technician: 403,
    inspector: 403,
    otherManager: 403,
  });
  const badZone = await api("owner").post("/api/admin/branches", { data: { ...newBranch, timeZone: "Mars/Olympus_Mons" } });
  expect(badZone.status()).toBe(400);
  expect((await badZone.json()).error.fieldErrors.timeZone).toBeTruthy();
  const created = await api("otherOwner").post("/api/admin/branches", { data: newBranch });
  expect(created.status()).toBe(201);
  const nampa = ((await created.json()) as { id: number }).id;

  await expectStatuses((a) => a.patch(`/api/admin/branches/${branch.COL}`, { data: { name: "Taken Over" } }), {
    anonymous: 401,
    officer: 403,
    manager: 403,
    technician: 403,
    inspector: 403,
    otherOwner: 404,
  });
  await expectStatuses((a) => a.patch(`/api/admin/branches/${nampa}`, { data: { archived: true } }), {
    owner: 404,
    otherManager: 403,
    otherOwner: 200,
  });
  const archived = (await (await api("otherOwner").get(`/api/admin/branches/${nampa}`)).json()) as { archivedAt: string | null };
  expect(archived.archivedAt).not.toBeNull();
  expect(((await (await api("owner").get(`/api/admin/branches/${branch.COL}`)).json()) as { name: string }).name).toBe("Columbus");
});

test("settings: read by the owner and the officer, changed only by the owner, of their own organisation", async () => {
  await expectStatuses((a) => a.get("/api/admin/settings"), {
    anonymous: 401,
    owner: 200,
    officer: 200,
    manager: 403,
    technician: 403,
    inspector: 403,
    otherOwner: 200,
  });
  const mine = (await (await api("owner").get("/api/admin/settings")).json()) as { name: string };
  const theirs = (await (await api("otherOwner").get("/api/admin/settings")).json()) as Record<string, unknown> & {
    name: string;
    rulePacks: string[];
    settings: Record<string, unknown>;
  };
  expect(mine.name).toBe("Kestrelmoor Climate Services");
  expect(theirs.name).not.toBe(mine.name);

  const same = { name: theirs.name, rulePacks: theirs.rulePacks, ...theirs.settings };
  await expectStatuses((a) => a.put("/api/admin/settings", { data: same }), {
    anonymous: 401,
    officer: 403,
    manager: 403,
    technician: 403,
    inspector: 403,
    otherManager: 403,
  });
  const bad = await api("owner").put("/api/admin/settings", { data: { ...same, name: mine.name, ptTolerancePsi: -3, rulePacks: [] } });
  expect(bad.status()).toBe(400);
  expect(Object.keys((await bad.json()).error.fieldErrors).sort()).toEqual(["ptTolerancePsi", "rulePacks"]);

  const changed = await api("otherOwner").put("/api/admin/settings", {
    data: { ...same, ptTolerancePsi: 3, rulePacks: ["us_federal", "eu"] },
  });
  expect(changed.status()).toBe(200);
  expect(await changed.json()).toMatchObject({ rulePacks: ["us_federal", "eu"], settings: { ptTolerancePsi: 3 } });
  // Put the second organisation back as it was, and check the first never changed.
  expect((await api("otherOwner").put("/api/admin/settings", { data: same })).status()).toBe(200);
  expect(((await (await api("officer").get("/api/admin/settings")).json()) as { name: string }).name).toBe(mine.name);
});

test("inspector access: listed for the owner and officer, given and withdrawn by them, in their own organisation only", async () => {
  await expectStatuses((a) => a.get("/api/admin/inspector-grants"), {
    anonymous: 401,
    owner: 200,
    officer: 200,
    manager: 403,
    technician: 403,
    inspector: 403,
    otherOwner: 200,
  });
  const theirs = (
    (await (await api("otherOwner").get("/api/admin/inspector-grants?pageSize=200")).json()) as { rows: { inspectorEmail: string }[] }
  ).rows;
  expect(theirs.map((g) => g.inspectorEmail)).not.toContain(DEMO.inspector);

  const inDays = (n: number) => new Date(Date.now() + n * 24 * 3600 * 1000).toISOString().slice(0, 10);
  const body = {
    email: `authz.inspector.${stamp}@cold-review.example`,
    name: "Matrix Inspector",
    branchIds: [branch.COL],
    recordsFrom: "2025-01-01",
    recordsTo: "2025-03-31",
    expiresOn: inDays(20),
  };
  await expectStatuses((a) => a.post("/api/admin/inspector-grants", { data: body }), {
    anonymous: 401,
    manager: 403,
    technician: 403,
    inspector: 403,
    otherManager: 403,
  });
  const crossOrg = await api("otherOwner").post("/api/admin/inspector-grants", { data: body });
  expect(crossOrg.status()).toBe(400);
  expect((await crossOrg.json()).error.fieldErrors.branchIds).toBeTruthy();
  const badWindow = await api("officer").post("/api/admin/inspector-grants", {
    data: { ...body, recordsFrom: "2025-06-01", recordsTo: "2025-01-01" },
  });
  expect(badWindow.status()).toBe(400);
  expect((await badWindow.json()).error.fieldErrors.recordsTo).toBeTruthy();
  const employee = await api("officer").post("/api/admin/inspector-grants", { data: { ...body, email: DEMO.managerColumbus } });
  expect(employee.status()).toBe(409);
  expect((await employee.json()).error.fieldErrors.email).toBeTruthy();

  const created = await api("officer").post("/api/admin/inspector-grants", { data: body });
  expect(created.status()).toBe(201);
  testGrant = ((await created.json()) as { id: number }).id;
  await expectStatuses((a) => a.post(`/api/admin/inspector-grants/${testGrant}/invitation`), {
    manager: 403,
    technician: 403,
    inspector: 403,
    otherOwner: 404,
    officer: 200,
  });
  await expectStatuses((a) => a.post(`/api/admin/inspector-grants/${testGrant}/revoke`), {
    anonymous: 401,
    manager: 403,
    technician: 403,
    inspector: 403,
    otherOwner: 404,
    otherManager: 403,
    officer: 200,
  });
  expect(await status(api("owner").post(`/api/admin/inspector-grants/${testGrant}/revoke`))).toBe(409);
});
