import { describe, expect, it } from "vitest";
import { ACTIONS, PERMISSIONS, can, type Action, type Role } from "@/lib/base/permission-table";

// Expected access, written out by hand from the product design (docs/README.md "Roles" and issue 2:
// reviewers read, run checks, export bundles and sign off; engineers also edit scenarios, parts and
// rules; owners also manage members, rename and delete the project and read the audit log).
// Deliberately not derived from PERMISSIONS, so a change to the table must be made here too.
const Y = true;
const N = false;
const EXPECTED: Record<Action, { owner: boolean; engineer: boolean; reviewer: boolean }> = {
  "project.read": { owner: Y, engineer: Y, reviewer: Y },
  "project.rename": { owner: Y, engineer: N, reviewer: N },
  "project.delete": { owner: Y, engineer: N, reviewer: N },
  "members.read": { owner: Y, engineer: Y, reviewer: Y },
  "members.manage": { owner: Y, engineer: N, reviewer: N },
  "audit.read": { owner: Y, engineer: N, reviewer: N },
  "scenario.read": { owner: Y, engineer: Y, reviewer: Y },
  "scenario.create": { owner: Y, engineer: Y, reviewer: N },
  "scenario.edit": { owner: Y, engineer: Y, reviewer: N },
  "scenario.delete": { owner: Y, engineer: Y, reviewer: N },
  "part.read": { owner: Y, engineer: Y, reviewer: Y },
  "part.upload": { owner: Y, engineer: Y, reviewer: N },
  "part.delete": { owner: Y, engineer: Y, reviewer: N },
  "rule.read": { owner: Y, engineer: Y, reviewer: Y },
  "rule.edit": { owner: Y, engineer: Y, reviewer: N },
  "check.run": { owner: Y, engineer: Y, reviewer: Y },
  "runs.clear": { owner: Y, engineer: N, reviewer: N },
  "bundle.export": { owner: Y, engineer: Y, reviewer: Y },
  "bundle.import": { owner: Y, engineer: Y, reviewer: N },
  "signoff.read": { owner: Y, engineer: Y, reviewer: Y },
  "signoff.request": { owner: Y, engineer: Y, reviewer: N },
  "signoff.decide": { owner: Y, engineer: N, reviewer: Y },
};

const ROLES: Role[] = ["owner", "engineer", "reviewer"];

describe("permission table", () => {
  it("lists exactly the actions the expectations cover", () => {
    expect([...ACTIONS].sort()).toEqual(Object.keys(EXPECTED).sort());
  });

  for (const action of Object.keys(EXPECTED) as Action[]) {
    for (const role of ROLES) {
      const allowed = EXPECTED[action][role];
      it(`${role} ${allowed ? "may" : "may not"} ${action}`, () => {
        expect(can(role, action)).toBe(allowed);
      });
    }
    it(`someone without a membership may not ${action}`, () => {
      expect(can(null, action)).toBe(false);
      expect(can(undefined, action)).toBe(false);
    });
  }

  it("every role named in the table is a known role", () => {
    for (const roles of Object.values(PERMISSIONS)) {
      for (const role of roles) expect(ROLES).toContain(role);
    }
  });
});
