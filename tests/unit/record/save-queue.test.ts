import { describe, expect, it } from "vitest";
import {
  afterConflict,
  afterSaved,
  fromEarlierQueue,
  inSendingOrder,
  knownFromToken,
  readStoredQueue,
  restoredInputs,
  restoredReasons,
  saveOutcome,
  saveRequestBody,
  tokenOf,
  withoutSlot,
  withQueued,
  type Pending,
} from "@/components/record/save-queue";

let n = 0;
const nothing = { value: null, missingReason: null };
const item = (p: Partial<Pending> & Pick<Pending, "plotId" | "key" | "value">): Pending => ({ reason: null, clientSaveId: `id-${(n += 1)}`, seq: n, knownSaved: nothing, ...p });
const count = (value: string) => item({ plotId: 7, key: "emergence_count@5", value });
const died = item({ plotId: 7, key: "emergence_count@5", value: "", reason: "died" });
const slot = "7:emergence_count@5";

describe("the phone form's offline queue", () => {
  it("keeps only the latest value typed for a plot's field", () => {
    const q = withQueued(withQueued({}, count("4")), count("5"));
    expect(Object.keys(q)).toEqual([slot]);
    expect(q[slot]!.value).toBe("5");
  });

  it("a value saved while a newer one was typed leaves the newer one waiting, knowing the server now holds the phone's own value", () => {
    const older = count("4");
    const newer = count("5");
    const q = withQueued({}, newer);
    expect(afterSaved(q, older)[slot]).toEqual({ ...newer, knownSaved: { value: "4", missingReason: null } });
    expect(afterSaved(q, newer)).toEqual({});
    // The same value committed twice (Enter, then leaving the field) is one save.
    expect(afterSaved(withQueued({}, count("4")), older)).toEqual({});
  });

  it("values go out in the order they were typed, and one waiting for the grower's choice stays back", () => {
    const first = item({ plotId: 9, key: "quality", value: "5", seq: 1 });
    const second = item({ plotId: 3, key: "quality", value: "6", seq: 2 });
    const third = item({ plotId: 1, key: "quality", value: "7", seq: 3 });
    const q = withQueued(withQueued(withQueued({}, third), first), second);
    expect(inSendingOrder(q).map((i) => i.plotId)).toEqual([9, 3, 1]);
    const waiting = afterConflict(q, second, { saved: "8", savedReason: null });
    expect(inSendingOrder(waiting).map((i) => i.plotId)).toEqual([9, 1]);
    expect(waiting["3:quality"]!.conflict).toEqual({ saved: "8", savedReason: null });
  });

  it("drops a refused value from the queue and leaves other fields queued", () => {
    const other = item({ plotId: 8, key: "quality", value: "5" });
    const q = withQueued(withQueued({}, count("x")), other);
    expect(withoutSlot(q, slot)).toEqual({ "8:quality": other });
  });

  it("stops retrying a value the server refused, and names the field's own message", () => {
    expect(saveOutcome({ ok: false, status: 400, slot, body: { error: "2 values need fixing.", fieldErrors: { [slot]: ["Counts are whole numbers."] } } })).toEqual({ kind: "refused", message: "Counts are whole numbers." });
    expect(saveOutcome({ ok: false, status: 409, slot, body: { error: "This data is locked." } })).toEqual({ kind: "refused", message: "This data is locked." });
    for (const status of [403, 404, 413, 415]) expect(saveOutcome({ ok: false, status, slot, body: {} }).kind).toBe("refused");
  });

  it("a value someone else changed comes back as a choice between both values, not a refusal", () => {
    const body = { error: "This value was changed by someone else since you last saw it.", conflicts: [{ plotId: 7, key: "emergence_count@5", saved: "3", savedReason: null }] };
    expect(saveOutcome({ ok: false, status: 409, slot, body })).toEqual({ kind: "conflict", server: { saved: "3", savedReason: null } });
  });

  it("keeps a value for retrying when the server is unreachable, busy or the grower was signed out", () => {
    expect(saveOutcome({ ok: false, status: 503, slot })).toEqual({ kind: "retry", signedOut: false });
    expect(saveOutcome({ ok: false, status: 500, slot })).toEqual({ kind: "retry", signedOut: false });
    expect(saveOutcome({ ok: false, status: 401, slot })).toEqual({ kind: "retry", signedOut: true });
    expect(saveOutcome({ ok: true, status: 200, slot })).toEqual({ kind: "saved" });
  });

  it("sends an empty field as no value, with the reason, its own id and what the phone knew was saved", () => {
    expect(saveRequestBody({ trialId: 1, siteId: 2, item: died })).toEqual({
      trialId: 1,
      siteId: 2,
      clientSaveId: died.clientSaveId,
      values: [{ plotId: 7, key: "emergence_count@5", value: null, missingReason: "died", knownSaved: nothing }],
    });
    const six = item({ plotId: 7, key: "quality", value: "6", knownSaved: { value: "5", missingReason: null } });
    expect(saveRequestBody({ trialId: 1, siteId: 2, item: six }).values[0]).toEqual({ plotId: 7, key: "quality", value: "6", missingReason: null, knownSaved: { value: "5", missingReason: null } });
  });

  it("reads a slot's token back as what the server holds", () => {
    expect(knownFromToken(tokenOf("", "died"))).toEqual({ value: null, missingReason: "died" });
    expect(knownFromToken("4")).toEqual({ value: "4", missingReason: null });
    expect(knownFromToken("")).toEqual(nothing);
    expect(knownFromToken(undefined)).toEqual(nothing);
  });

  it("reads back what the phone kept, and leaves out anything unreadable", () => {
    const q = withQueued(withQueued({}, count("5")), item({ plotId: 9, key: "quality", value: "", reason: "weather" }));
    expect(readStoredQueue(structuredClone(q))).toEqual(q);
    for (const stored of [null, undefined, "", "{not json", 42, [1, 2]]) expect(readStoredQueue(stored)).toEqual({});
    expect(readStoredQueue({ a: { plotId: 1, key: "quality", value: "5" }, [slot]: count("6") })).toEqual({ [slot]: expect.objectContaining({ value: "6" }) });
  });

  it("values an earlier version of the form left in localStorage are not lost: they join the queue with ids and what the page says is saved", () => {
    const text = JSON.stringify({ [slot]: { plotId: 7, key: "emergence_count@5", value: "4", reason: null }, "9:quality": { plotId: 9, key: "quality", value: "", reason: "weather" }, bad: { plotId: "x" } });
    const ids = ["a", "b"];
    const q = fromEarlierQueue(text, (s) => (s === slot ? { value: "3", missingReason: null } : nothing), 100, () => ids.shift()!);
    expect(q).toEqual({
      [slot]: { plotId: 7, key: "emergence_count@5", value: "4", reason: null, clientSaveId: "a", seq: 100, knownSaved: { value: "3", missingReason: null } },
      "9:quality": { plotId: 9, key: "quality", value: "", reason: "weather", clientSaveId: "b", seq: 101, knownSaved: nothing },
    });
    for (const t of [null, "", "{not json", "[1]", "42"]) expect(fromEarlierQueue(t, () => nothing, 1, () => "x")).toEqual({});
  });

  it("shows restored values in their fields, and a restored value clears a reason shown for its field", () => {
    const stored = withQueued(withQueued({}, count("5")), item({ plotId: 9, key: "quality", value: "", reason: "weather" }));
    expect(restoredInputs({ [slot]: "3", "10:quality": "7" }, stored)).toEqual({ [slot]: "5", "9:quality": "", "10:quality": "7" });
    expect(restoredReasons({ [slot]: "died", "10:quality": "lost_label" }, stored)).toEqual({ "9:quality": "weather", "10:quality": "lost_label" });
  });
});
