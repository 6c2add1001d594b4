import { describe, expect, it } from "vitest";
import { auditCsv, describeAuditEvent, toCsv } from "@/lib/domain/audit/describe";
import { auditFilterOf, auditQuerySchema, parseAuditQuery } from "@/lib/base/validation/audit";

describe("describeAuditEvent", () => {
  it("says what happened in words, with units, and without ids or JSON", () => {
    expect(describeAuditEvent({ action: "member.role_change", target: "emil@example.test", detail: { from: "reviewer", to: "engineer" } })).toBe(
      "Changed emil@example.test's role from reviewer to engineer",
    );
    const rule = describeAuditEvent({
      action: "rule.create",
      target: "iso-tx-rx",
      detail: { ruleId: "r-123", spec: { id: "iso-tx-rx", kind: "isolation", from: "TX", to: "RX", min_db: 30, band_hz: [2.4e9, 2.5e9] } },
    });
    expect(rule).toBe("Added the rule iso-tx-rx: isolation (from TX, to RX, min 30 dB, band 2.4 GHz–2.5 GHz)");
    expect(rule).not.toMatch(/[{}"]|r-123/);
    expect(describeAuditEvent({ action: "scenario.rename", target: "B", detail: { scenarioId: "s1", from: "A", to: "B" } })).toBe("Renamed the scenario A to B");
  });

  it("falls back to readable words for an action it does not know", () => {
    expect(describeAuditEvent({ action: "widget.spin_up", target: "W1", detail: { speed_hz: 1500, widgetId: "x" } })).toBe("widget spin up W1 (speed 1.5 kHz)");
  });
});

describe("CSV export", () => {
  // RFC 4180 §2: fields containing commas, quotes or line breaks are quoted, quotes doubled, CRLF line ends.
  it("quotes per RFC 4180 and defuses spreadsheet formulas (OWASP CSV injection guidance)", () => {
    expect(toCsv([["a,b", 'say "hi"', "two\nlines", "=1+1", "plain"]])).toBe('"a,b","say ""hi""","two\nlines",\'=1+1,plain\r\n');
  });

  it("writes one row per event with the sentence and the UTC time", () => {
    const csv = auditCsv([{ action: "user.grant_admin", target: "rhea@example.test", detail: null, createdAt: new Date("2026-12-04T03:10:00Z"), actorName: "Olive", actorEmail: "olive@example.test" }]);
    expect(csv.split("\r\n")[1]).toBe("2026-12-04T03:10:00.000Z,Olive,olive@example.test,Made rhea@example.test a site admin,user.grant_admin,rhea@example.test");
  });
});

describe("audit query", () => {
  it("turns days into whole UTC days, the last one included, and pages by 200", () => {
    const q = auditQuerySchema.parse({ from: "2026-12-01", to: "2026-12-03", page: "3" });
    const f = auditFilterOf(q);
    expect(f.from?.toISOString()).toBe("2026-12-01T00:00:00.000Z");
    expect(f.to?.toISOString()).toBe("2026-12-04T00:00:00.000Z");
    expect(f.offset).toBe(400);
    expect(f.limit).toBe(201);
  });

  it("ignores blank values and names bad fields", () => {
    expect(parseAuditQuery({ person: "", kind: "  " }).success).toBe(true);
    const bad = parseAuditQuery(new URLSearchParams("from=2026-02-30x&page=-1"));
    expect(bad.success).toBe(false);
    if (!bad.success) expect([...new Set(bad.error.issues.map((i) => i.path[0]))].sort()).toEqual(["from", "page"]);
  });
});
