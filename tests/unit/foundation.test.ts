import { describe, expect, it } from "vitest";
import { canChangeRole, canRecordForSite, canSeeBlindKey, canSeeSiteContact, isStaff } from "@/lib/domain/permissions";
import { acceptInviteSchema, inviteCooperatorSchema, signInSchema } from "@/lib/validation/auth";
import { addDays, scheduleForSite, scheduleSummary } from "@/lib/domain/schedule";
import { randomiseBlocks } from "@/lib/domain/design/randomise";
import { blindCodes } from "@/lib/domain/design/blind-codes";
import type { Viewer } from "@/lib/domain/viewer";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

const english = translatorFor("en");
const spanish = translatorFor("es");

const admin: Viewer = { id: 1, email: "a@x.org", name: "A", role: "admin" };
const coordinator: Viewer = { id: 2, email: "c@x.org", name: "C", role: "coordinator" };
const grower: Viewer = { id: 3, email: "g@x.org", name: "G", role: "cooperator" };

describe("permissions", () => {
  it("lets a cooperator record only for their own sites", () => {
    expect(canRecordForSite(grower, { cooperatorIds: [3] })).toBe(true);
    expect(canRecordForSite(grower, { cooperatorIds: [4] })).toBe(false);
    expect(canRecordForSite(null, { cooperatorIds: [3] })).toBe(false);
    expect(canRecordForSite(coordinator, { cooperatorIds: [] })).toBe(true);
    expect(canSeeSiteContact(grower, { cooperatorIds: [9] })).toBe(false);
  });
  it("keeps the blind key from growers and the public until publication", () => {
    expect(canSeeBlindKey(grower, { status: "collecting" })).toBe(false);
    expect(canSeeBlindKey(null, { status: "analysing" })).toBe(false);
    expect(canSeeBlindKey(null, { status: "published" })).toBe(true);
    expect(canSeeBlindKey(coordinator, { status: "draft" })).toBe(true);
  });
  it("stops an admin from changing their own role", () => {
    expect(canChangeRole(admin, { id: 1 })).toBe(false);
    expect(canChangeRole(admin, { id: 2 })).toBe(true);
    expect(canChangeRole(coordinator, { id: 3 })).toBe(false);
    expect(isStaff(grower)).toBe(false);
  });
});

describe("form validation answers in plain words", () => {
  it("explains a malformed e-mail and a missing password", () => {
    const r = signInSchema(english).safeParse({ email: "not-an-email", password: "" });
    expect(r.success).toBe(false);
    const messages = r.error!.issues.map((i) => i.message);
    expect(messages).toContain("Enter an e-mail address like name@example.org.");
    expect(messages).toContain("Enter your password.");
  });
  it("normalises e-mail case and spaces", () => {
    expect(signInSchema(english).parse({ email: "  Rosa@Example.ORG ", password: "x" }).email).toBe("rosa@example.org");
  });
  it("requires matching passwords of at least 10 characters", () => {
    const short = acceptInviteSchema(english).safeParse({ token: "a".repeat(43), name: "Al Grower", password: "short", confirm: "short" });
    expect(short.error!.issues[0]!.message).toBe("Use at least 10 characters.");
    const mismatch = acceptInviteSchema(english).safeParse({ token: "a".repeat(43), name: "Al Grower", password: "long-enough-1", confirm: "long-enough-2" });
    expect(mismatch.error!.issues[0]!.message).toBe("The two passwords are not the same.");
  });
  it("a Spanish reader's sign-in and new-password checks come out in Spanish", () => {
    const signIn = signInSchema(spanish).safeParse({ email: "not-an-email", password: "" });
    const messages = signIn.error!.issues.map((i) => i.message);
    expect(messages).toContain("Escriba una dirección de correo como nombre@ejemplo.org.");
    expect(messages).toContain("Escriba su contraseña.");
    const short = acceptInviteSchema(spanish).safeParse({ token: "a".repeat(43), name: "Ana", password: "corta", confirm: "corta" });
    expect(short.error!.issues[0]!.message).toBe("Use al menos 10 caracteres.");
    const mismatch = acceptInviteSchema(spanish).safeParse({ token: "a".repeat(43), name: "Ana", password: "bastante-larga-1", confirm: "bastante-larga-2" });
    expect(mismatch.error!.issues[0]!.message).toBe("Las dos contraseñas no coinciden.");
  });
  it("asks for the grower's site when it is blank or not a site", () => {
    for (const siteId of ["", "abc", undefined]) {
      const parsed = inviteCooperatorSchema.safeParse({ name: "Jo Grower", email: "jo@x.org", siteId });
      expect(parsed.error!.issues[0]!.message).toBe("Choose the grower's site.");
    }
    expect(inviteCooperatorSchema.parse({ name: "Jo Grower", email: "jo@x.org", siteId: "7" }).siteId).toBe(7);
  });
});

describe("schedule of scheduled counts", () => {
  it("marks counts late, due today, upcoming or done from the site's own sowing date", () => {
    const items = scheduleForSite({
      sownOn: "2026-11-20",
      plotCount: 18,
      columns: [5, 7, 10, 14].map((day) => ({ traitId: 7, name: `Emergence day ${day}`, occasion: day, dueDay: day, dueNote: null, valueType: "count" as const })),
      recorded: new Map([["7:5", 18], ["7:7", 10]]),
      today: "2026-11-30",
    });
    expect(items.map((i) => [i.occasion, i.dueOn, i.status])).toEqual([
      [5, "2026-11-25", "done"],
      [7, "2026-11-27", "late"],
      [10, "2026-11-30", "due_today"],
      [14, "2026-12-04", "due_soon"],
    ]);
  });
  it("owes every value the form asks for: a once-recorded trait by its day, an event-timed one with no date, never a note", () => {
    const columns = [
      { traitId: 1, name: "Seeds sown", occasion: 0, dueDay: 0, dueNote: "At sowing", valueType: "count" as const },
      { traitId: 2, name: "Seedlings emerged (final)", occasion: 0, dueDay: 14, dueNote: null, valueType: "count" as const },
      { traitId: 3, name: "Marketable yield", occasion: 0, dueDay: null, dueNote: "At harvest", valueType: "number" as const },
      { traitId: 4, name: "Plot notes", occasion: 0, dueDay: null, dueNote: "Any time", valueType: "text" as const },
    ];
    // A site sown 30 days ago with nothing recorded: late, never "all in".
    const items = scheduleForSite({ sownOn: "2026-10-31", plotCount: 20, columns, recorded: new Map(), today: "2026-11-30" });
    expect(items.map((i) => [i.label, i.dueOn, i.status, i.when])).toEqual([
      ["Seeds sown", "2026-10-31", "late", "day 0 after sowing"],
      ["Seedlings emerged (final)", "2026-11-14", "late", "day 14 after sowing"],
      ["Marketable yield", null, "at_event", "at harvest"],
    ]);
    const summary = scheduleSummary(items);
    expect(summary.allIn).toBe(false);
    expect(summary.values).toEqual({ recorded: 0, expected: 60 });
    const done = scheduleSummary(scheduleForSite({ sownOn: "2026-10-31", plotCount: 20, columns, recorded: new Map([["1:0", 20], ["2:0", 20], ["3:0", 20]]), today: "2026-11-30" }));
    expect(done.allIn).toBe(true);
  });
  it("has nothing due before sowing", () => {
    expect(scheduleForSite({ sownOn: null, plotCount: 10, columns: [{ traitId: 1, name: "x day 5", occasion: 5, dueDay: 5, dueNote: null, valueType: "count" }], recorded: new Map(), today: "2026-01-01" })).toEqual([]);
  });
  it("adds days across month and year ends", () => {
    expect(addDays("2026-12-30", 3)).toBe("2027-01-02");
    expect(addDays("2028-02-27", 2)).toBe("2028-02-29");
  });
});

describe("randomisation helpers", () => {
  it("puts every entry once in every block and repeats from the same seed", () => {
    const a = randomiseBlocks({ entryCount: 6, blocks: 4, seed: 42 });
    for (let b = 1; b <= 4; b += 1) expect(a.filter((p) => p.block === b).map((p) => p.entryIndex).sort()).toEqual([0, 1, 2, 3, 4, 5]);
    expect(randomiseBlocks({ entryCount: 6, blocks: 4, seed: 42 })).toEqual(a);
    expect(randomiseBlocks({ entryCount: 6, blocks: 4, seed: 43 })).not.toEqual(a);
  });
  it("makes distinct codes without look-alike characters", () => {
    const codes = blindCodes(40, 1);
    expect(new Set(codes).size).toBe(40);
    for (const c of codes) expect(c).toMatch(/^[ACDEFGHJKMNPQRTWXY34679]{3}$/);
  });
});
