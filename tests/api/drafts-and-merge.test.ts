// Working drafts (autosave, per person) and deliberate revisions (note, stored change summary, three-way
// merge of saves from an older base), through the route handlers on a fresh database.
import { beforeAll, describe, expect, it } from "vitest";
import { call, countRows, createAccount, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";
import * as projectsRoute from "@/app/api/projects/route";
import * as scenariosRoute from "@/app/api/projects/[projectId]/scenarios/route";
import * as revisionsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/revisions/route";
import * as draftRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/draft/route";
import * as signoffsRoute from "@/app/api/projects/[projectId]/signoffs/route";
import { db } from "@/db/client";
import { memberships, scenarioDrafts, scenarioRevisions } from "@/db/schema";
import type { Scenario } from "@/engine/types";

type Account = Awaited<ReturnType<typeof createAccount>>;
let owner: Account;
let engineer: Account;
let reviewer: Account;
let stranger: Account;
let projectId: string;

type RevisionJson = { id: string; number: number; content: Scenario; note: string | null; mergedWith: number | null; summary: { against: number | null; changes: { area: string; text: string }[] } | null; authorName: string };
type DraftJson = { baseRevisionId: string; baseNumber: number; content: Scenario; updatedAt: string };

beforeAll(async () => {
  await setUpDatabase();
  owner = await createAccount({ email: "owner@example.test", name: "Olga Owner" });
  engineer = await createAccount({ email: "eng@example.test", name: "Ezra Engineer" });
  reviewer = await createAccount({ email: "rev@example.test", name: "Rita Reviewer" });
  stranger = await createAccount({ email: "stranger@example.test" });
  const created = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: owner.cookie, body: { name: "Osprey link" } }));
  projectId = ((await created.json()) as { project: { id: string } }).project.id;
  await db.insert(memberships).values([
    { projectId, userId: engineer.user.id, role: "engineer" },
    { projectId, userId: reviewer.user.id, role: "reviewer" },
  ]);
});

const base = () => `/api/projects/${projectId}/scenarios`;

function pads(): Scenario {
  return {
    format: "portolan.scenario/1",
    name: "Pads",
    z0: 50,
    frequency: { start: 1e9, stop: 2e9, points: 3 },
    blocks: [
      { id: "PAD1", kind: "attenuator", params: { loss_db: 3 } },
      { id: "PAD2", kind: "attenuator", params: { loss_db: 3 } },
    ],
    links: [["PAD1:2", "PAD2:1"]],
    ports: [
      { name: "TX", at: "PAD1:1" },
      { name: "OUT", at: "PAD2:2" },
    ],
  };
}

const withLoss = (sc: Scenario, id: string, loss: number): Scenario => ({ ...sc, blocks: sc.blocks.map((b) => (b.id === id ? { ...b, params: { loss_db: loss } } : b)) });

async function newScenario(name: string): Promise<{ id: string; revision: RevisionJson }> {
  const response = await call(scenariosRoute.POST, makeRequest("POST", base(), { cookie: engineer.cookie, body: { name, scenario: pads() } }), { projectId });
  expect(response.status).toBe(201);
  const body = (await response.json()) as { scenario: { id: string }; revision: RevisionJson };
  return { id: body.scenario.id, revision: body.revision };
}

const save = (cookie: string, scenarioId: string, body: unknown) => call(revisionsRoute.POST, makeRequest("POST", `${base()}/${scenarioId}/revisions`, { cookie, body }), { projectId, scenarioId });
const putDraft = (cookie: string, scenarioId: string, body: unknown) => call(draftRoute.PUT, makeRequest("PUT", `${base()}/${scenarioId}/draft`, { cookie, body }), { projectId, scenarioId });
const getDraft = (cookie: string, scenarioId: string) => call(draftRoute.GET, makeRequest("GET", `${base()}/${scenarioId}/draft`, { cookie }), { projectId, scenarioId });
const deleteDraft = (cookie: string, scenarioId: string) => call(draftRoute.DELETE, makeRequest("DELETE", `${base()}/${scenarioId}/draft`, { cookie }), { projectId, scenarioId });

describe("working drafts", () => {
  it("an engineer's draft is stored without a revision, read back by them only, replaced by the next autosave", async () => {
    const { id, revision } = await newScenario("Drafted");
    const revisionsBefore = await countRows(scenarioRevisions);
    const put = await putDraft(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD1", 6) });
    expect(put.status).toBe(200);
    expect(await countRows(scenarioRevisions)).toBe(revisionsBefore);
    await putDraft(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD1", 7) });
    const mine = (await (await getDraft(engineer.cookie, id)).json()) as { draft: DraftJson };
    expect(mine.draft.baseNumber).toBe(1);
    expect(mine.draft.content.blocks[0].params).toEqual({ loss_db: 7 });
    // nobody else reads it: the owner of the project has no draft of their own here
    expect(((await (await getDraft(owner.cookie, id)).json()) as { draft: DraftJson | null }).draft).toBeNull();
    expect(await countRows(scenarioDrafts)).toBe(1);
  });

  it("reviewers cannot read or write drafts (403), strangers get 404, and nothing is written", async () => {
    const { id, revision } = await newScenario("Guarded");
    const before = await countRows(scenarioDrafts);
    expect((await putDraft(reviewer.cookie, id, { baseRevisionId: revision.id, scenario: pads() })).status).toBe(403);
    expect((await getDraft(reviewer.cookie, id)).status).toBe(403);
    expect((await putDraft(stranger.cookie, id, { baseRevisionId: revision.id, scenario: pads() })).status).toBe(404);
    expect(await countRows(scenarioDrafts)).toBe(before);
  });

  it("bad input names the field (zod) and a base from another scenario is refused; nothing is written", async () => {
    const { id } = await newScenario("Checked");
    const other = await newScenario("Other");
    const before = await countRows(scenarioDrafts);
    const bad = await putDraft(engineer.cookie, id, { baseRevisionId: other.revision.id, scenario: { ...pads(), z0: "fifty" } });
    expect(bad.status).toBe(400);
    expect(JSON.stringify(((await bad.json()) as ErrorJson).error)).toMatch(/z0/);
    const foreign = await putDraft(engineer.cookie, id, { baseRevisionId: other.revision.id, scenario: pads() });
    expect(foreign.status).toBe(422);
    expect(((await foreign.json()) as ErrorJson).error.fields).toHaveProperty("baseRevisionId");
    expect(await countRows(scenarioDrafts)).toBe(before);
  });

  it("discarding deletes the draft; saving a revision deletes the saver's draft too", async () => {
    const { id, revision } = await newScenario("Discarded");
    await putDraft(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD2", 9) });
    expect((await deleteDraft(engineer.cookie, id)).status).toBe(204);
    expect(((await (await getDraft(engineer.cookie, id)).json()) as { draft: DraftJson | null }).draft).toBeNull();
    await putDraft(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD2", 9) });
    await putDraft(owner.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD1", 1) });
    expect((await save(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD2", 9) })).status).toBe(201);
    expect(((await (await getDraft(engineer.cookie, id)).json()) as { draft: DraftJson | null }).draft).toBeNull();
    // the owner's own draft is theirs to keep
    expect(((await (await getDraft(owner.cookie, id)).json()) as { draft: DraftJson | null }).draft?.content.blocks[0].params).toEqual({ loss_db: 1 });
  });
});

describe("deliberate revisions", () => {
  it("a save stores its note and a summary of what changed against the previous revision, in words with units", async () => {
    const { id, revision } = await newScenario("Noted");
    const response = await save(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD2", 6), note: "  Heavier output pad  " });
    expect(response.status).toBe(201);
    const body = (await response.json()) as { revision: RevisionJson; merged: null };
    expect(body.merged).toBeNull();
    expect(body.revision.note).toBe("Heavier output pad");
    expect(body.revision.summary).toEqual({ against: 1, changes: [{ area: "parameters", text: "PAD2 loss_db: 3 dB → 6 dB" }] });
    const list = (await (await call(revisionsRoute.GET, makeRequest("GET", `${base()}/${id}/revisions`, { cookie: reviewer.cookie }), { projectId, scenarioId: id })).json()) as { revisions: RevisionJson[] };
    expect(list.revisions[0]).toMatchObject({ number: 2, note: "Heavier output pad", authorName: "Ezra Engineer" });
    expect(list.revisions[0].summary?.changes[0].text).toBe("PAD2 loss_db: 3 dB → 6 dB");
  });

  it("a save without a note (the token/CLI form) still works", async () => {
    const { id, revision } = await newScenario("Unnoted");
    const response = await save(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD1", 4) });
    expect(response.status).toBe(201);
    expect(((await response.json()) as { revision: RevisionJson }).revision.note).toBeNull();
  });

  it("a too long note is refused naming the field, nothing written", async () => {
    const { id, revision } = await newScenario("Long note");
    const before = await countRows(scenarioRevisions);
    const response = await save(engineer.cookie, id, { baseRevisionId: revision.id, scenario: pads(), note: "x".repeat(2001) });
    expect(response.status).toBe(400);
    expect(JSON.stringify(((await response.json()) as ErrorJson).error)).toMatch(/note/);
    expect(await countRows(scenarioRevisions)).toBe(before);
  });

  it("two people editing different blocks from the same base: the second save merges and says with which revision", async () => {
    const { id, revision } = await newScenario("Merged");
    expect((await save(owner.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD1", 10) })).status).toBe(201);
    const second = await save(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD2", 20), note: "output pad" });
    expect(second.status).toBe(201);
    const body = (await second.json()) as { revision: RevisionJson; merged: { number: number; authorName: string; settled: number } };
    expect(body.merged).toEqual({ number: 2, authorName: "Olga Owner", settled: 0 });
    expect(body.revision.number).toBe(3);
    expect(body.revision.mergedWith).toBe(2);
    expect(body.revision.content.blocks.map((b) => b.params?.loss_db)).toEqual([10, 20]);
    // the summary is against the revision before (r2, the owner's), so it names only this person's edit
    expect(body.revision.summary?.changes.map((c) => c.text)).toEqual(["PAD2 loss_db: 3 dB → 20 dB"]);
  });

  it("the same parameter changed by both: 409 lists the conflict; posting the choice settles it", async () => {
    const { id, revision } = await newScenario("Conflicted");
    await save(owner.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD1", 10) });
    const before = await countRows(scenarioRevisions);
    const clash = await save(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(withLoss(pads(), "PAD1", 12), "PAD2", 5) });
    expect(clash.status).toBe(409);
    const body = (await clash.json()) as { current: { number: number; authorName: string }; conflicts: { key: string; label: string; mine: string; theirs: string }[] };
    expect(body.current).toMatchObject({ number: 2, authorName: "Olga Owner" });
    expect(body.conflicts).toEqual([{ key: "block:PAD1:param:loss_db", area: "parameter", label: "PAD1 loss_db", mine: "12 dB", theirs: "10 dB" }]);
    expect(await countRows(scenarioRevisions)).toBe(before);
    const settled = await save(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(withLoss(pads(), "PAD1", 12), "PAD2", 5), resolutions: { "block:PAD1:param:loss_db": "theirs" } });
    expect(settled.status).toBe(201);
    const done = (await settled.json()) as { revision: RevisionJson; merged: { settled: number } };
    expect(done.merged.settled).toBe(1);
    expect(done.revision.content.blocks.map((b) => b.params?.loss_db)).toEqual([10, 5]);
  });

  it("a resolution that is neither mine nor theirs is refused (400)", async () => {
    const { id, revision } = await newScenario("Bad resolution");
    const response = await save(engineer.cookie, id, { baseRevisionId: revision.id, scenario: pads(), resolutions: { "block:PAD1:param:loss_db": "both" } });
    expect(response.status).toBe(400);
  });
});

describe("sign-off and the working draft", () => {
  it("a request while the requester's draft holds changes not in the revision is 409; once saved it goes through", async () => {
    const { id, revision } = await newScenario("Signed");
    const ask = () => call(signoffsRoute.POST, makeRequest("POST", `/api/projects/${projectId}/signoffs`, { cookie: engineer.cookie, body: { scenarioId: id, reviewerIds: [reviewer.user.id] } }), { projectId });
    await putDraft(engineer.cookie, id, { baseRevisionId: revision.id, scenario: withLoss(pads(), "PAD1", 6) });
    const refused = await ask();
    expect(refused.status).toBe(409);
    expect(((await refused.json()) as ErrorJson).error.message).toMatch(/working draft of this scenario has changes not in revision 1/);
    // a draft that only repeats the revision does not stand in the way
    await putDraft(engineer.cookie, id, { baseRevisionId: revision.id, scenario: pads() });
    expect((await ask()).status).toBe(201);
  });
});
